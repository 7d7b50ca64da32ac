-- The registry's full-text index gains a first column, `scope`: one word per piece naming its studio and
-- whether it is archived ('s' + the studio id's UTF-8 bytes in hex + 'live' or 'arch'; the same word as
-- searchScope in lib/pieces/search-index.ts). A text search's count can then be answered by the index
-- alone (its word ANDed with what was typed) instead of reading each match's piece for its studio and
-- archived state (lib/pieces/registry-sql.ts, countMatches). Searches of what was typed name the four
-- text columns, so a typed word never matches a scope word. First column: an index entry of column 0
-- needs no column number, so the scope words' lists are the shortest they can be.
-- The rows are copied with their rowids; a row whose piece is gone (or whose rowid is another piece's)
-- is left behind. Kept right by indexPiece (every write of a piece's text) and by the triggers below:
-- a piece's studio or archived state changed by any UPDATE, and a piece deleted by any DELETE (a studio's
-- deletion cascading included), change or remove its index row in the same statement.
CREATE VIRTUAL TABLE `pieces_fts_scoped` USING fts5(
	`scope`,
	`piece_id` UNINDEXED,
	`studio_id` UNINDEXED,
	`title`,
	`species`,
	`owner`,
	`notes`,
	tokenize = 'unicode61 remove_diacritics 2',
	prefix = '2 3 4 5 6 7 8'
);
--> statement-breakpoint
INSERT INTO `pieces_fts_scoped` (`rowid`, `scope`, `piece_id`, `studio_id`, `title`, `species`, `owner`, `notes`)
	SELECT f.`rowid`, 's' || lower(hex(p.`studio_id`)) || CASE WHEN p.`archived_at` IS NULL THEN 'live' ELSE 'arch' END,
		f.`piece_id`, p.`studio_id`, f.`title`, f.`species`, f.`owner`, f.`notes`
	FROM `pieces_fts` f JOIN `pieces` p ON p.`rowid` = f.`rowid` AND p.`id` = f.`piece_id`;
--> statement-breakpoint
DROP TABLE `pieces_fts`;
--> statement-breakpoint
ALTER TABLE `pieces_fts_scoped` RENAME TO `pieces_fts`;
--> statement-breakpoint
INSERT INTO `pieces_fts` (`pieces_fts`) VALUES ('optimize');
--> statement-breakpoint
CREATE TRIGGER `pieces_fts_scope_au` AFTER UPDATE OF `studio_id`, `archived_at` ON `pieces`
	WHEN old.`studio_id` IS NOT new.`studio_id` OR (old.`archived_at` IS NULL) <> (new.`archived_at` IS NULL)
BEGIN
	UPDATE `pieces_fts`
		SET `scope` = 's' || lower(hex(new.`studio_id`)) || CASE WHEN new.`archived_at` IS NULL THEN 'live' ELSE 'arch' END, `studio_id` = new.`studio_id`
		WHERE `rowid` = new.`rowid`;
END;
--> statement-breakpoint
CREATE TRIGGER `pieces_fts_ad` AFTER DELETE ON `pieces`
BEGIN
	DELETE FROM `pieces_fts` WHERE `rowid` = old.`rowid`;
END;
