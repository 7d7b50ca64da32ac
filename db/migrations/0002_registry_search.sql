-- Full-text index of the piece registry (SQLite FTS5). Maintained by lib/pieces (one row per piece,
-- rewritten when the piece, its owner or its layers change): species names and aliases come from
-- lib/care/species, which SQL cannot see.
CREATE VIRTUAL TABLE `pieces_fts` USING fts5(
	`piece_id` UNINDEXED,
	`studio_id` UNINDEXED,
	`title`,
	`species`,
	`owner`,
	`notes`,
	tokenize = 'unicode61 remove_diacritics 2'
);
