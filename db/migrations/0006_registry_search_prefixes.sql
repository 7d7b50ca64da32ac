-- Prefix indexes for the registry's full-text search. Every search token is a prefix query ("walnut"*),
-- which without an index of that prefix length reads and merges every matching term's whole doclist
-- before the first row; with one, FTS5 walks it like a whole word and stops at the page. Lengths 2–8
-- cover most typed words (SQLite FTS5 documentation, "Prefix Indexes"; from memory); longer prefixes match few
-- terms. The rows are copied as they are: same rowids, same columns.
CREATE VIRTUAL TABLE `pieces_fts_prefixed` USING fts5(
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
INSERT INTO `pieces_fts_prefixed` (`rowid`, `piece_id`, `studio_id`, `title`, `species`, `owner`, `notes`)
	SELECT `rowid`, `piece_id`, `studio_id`, `title`, `species`, `owner`, `notes` FROM `pieces_fts`;
--> statement-breakpoint
DROP TABLE `pieces_fts`;
--> statement-breakpoint
ALTER TABLE `pieces_fts_prefixed` RENAME TO `pieces_fts`;
--> statement-breakpoint
INSERT INTO `pieces_fts` (`pieces_fts`) VALUES ('optimize');
