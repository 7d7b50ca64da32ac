-- The registry list shows each piece's finish classes in layer order (lib/pieces/registry-sql.ts: a
-- subquery per row of the page, by piece, surface and position). With finish_class in the piece's layer
-- index that subquery reads the index alone, not each layer's row (the care engine's reads by piece,
-- surface and position use the same index as before).
DROP INDEX `finish_layers_piece_idx`;--> statement-breakpoint
CREATE INDEX `finish_layers_piece_idx` ON `finish_layers` (`piece_id`,`surface`,`position`,`finish_class`);