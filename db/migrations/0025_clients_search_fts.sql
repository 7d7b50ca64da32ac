-- Full-text indexes for the clients list search (lib/clients/list.ts), kept by triggers so every
-- write path (forms, the API, CSV import, erase, the bench seed) keeps them current without code.
--   clients_fts: name, e-mail and phone, trigram-tokenised, so a word matches anywhere inside them
--     as LIKE '%word%' did (SQLite FTS5 documentation, "The Trigram Tokenizer"; from memory);
--   client_titles_fts: the titles of the client's pieces, one row per client, tokenised like the
--     registry's index (pieces_fts) so a word matches by the start of a title word, as before.
-- Both are keyed by the client's rowid, as pieces_fts is by the piece's: a VACUUM, which may renumber
-- rowids, must be followed by refilling them (the two INSERT … SELECT statements below).
CREATE VIRTUAL TABLE `clients_fts` USING fts5(
	`name`,
	`email`,
	`phone`,
	tokenize = 'trigram case_sensitive 0'
);
--> statement-breakpoint
CREATE VIRTUAL TABLE `client_titles_fts` USING fts5(
	`titles`,
	tokenize = 'unicode61 remove_diacritics 2',
	prefix = '2 3 4 5 6 7 8'
);
--> statement-breakpoint
INSERT INTO `clients_fts` (`rowid`, `name`, `email`, `phone`)
	SELECT `rowid`, `name`, coalesce(`email`, ''), coalesce(`phone`, '') FROM `clients`;
--> statement-breakpoint
INSERT INTO `client_titles_fts` (`rowid`, `titles`)
	SELECT c.`rowid`, group_concat(p.`title`, char(10)) FROM `clients` c JOIN `pieces` p ON p.`client_id` = c.`id` AND p.`studio_id` = c.`studio_id` GROUP BY c.`rowid`;
--> statement-breakpoint
CREATE TRIGGER `clients_fts_ai` AFTER INSERT ON `clients` BEGIN
	INSERT INTO `clients_fts` (`rowid`, `name`, `email`, `phone`) VALUES (new.`rowid`, new.`name`, coalesce(new.`email`, ''), coalesce(new.`phone`, ''));
END;
--> statement-breakpoint
CREATE TRIGGER `clients_fts_au` AFTER UPDATE OF `name`, `email`, `phone` ON `clients` BEGIN
	DELETE FROM `clients_fts` WHERE `rowid` = old.`rowid`;
	INSERT INTO `clients_fts` (`rowid`, `name`, `email`, `phone`) VALUES (new.`rowid`, new.`name`, coalesce(new.`email`, ''), coalesce(new.`phone`, ''));
END;
--> statement-breakpoint
CREATE TRIGGER `clients_fts_ad` AFTER DELETE ON `clients` BEGIN
	DELETE FROM `clients_fts` WHERE `rowid` = old.`rowid`;
	DELETE FROM `client_titles_fts` WHERE `rowid` = old.`rowid`;
END;
--> statement-breakpoint
CREATE TRIGGER `client_titles_fts_ai` AFTER INSERT ON `pieces` WHEN new.`client_id` IS NOT NULL BEGIN
	DELETE FROM `client_titles_fts` WHERE `rowid` = (SELECT `rowid` FROM `clients` WHERE `id` = new.`client_id`);
	INSERT INTO `client_titles_fts` (`rowid`, `titles`)
		SELECT c.`rowid`, group_concat(p.`title`, char(10)) FROM `clients` c JOIN `pieces` p ON p.`client_id` = c.`id` AND p.`studio_id` = c.`studio_id` WHERE c.`id` = new.`client_id` GROUP BY c.`rowid`;
END;
--> statement-breakpoint
CREATE TRIGGER `client_titles_fts_au` AFTER UPDATE OF `title`, `client_id`, `studio_id` ON `pieces` WHEN old.`client_id` IS NOT NULL OR new.`client_id` IS NOT NULL BEGIN
	DELETE FROM `client_titles_fts` WHERE `rowid` IN (SELECT `rowid` FROM `clients` WHERE `id` IN (old.`client_id`, new.`client_id`));
	INSERT INTO `client_titles_fts` (`rowid`, `titles`)
		SELECT c.`rowid`, group_concat(p.`title`, char(10)) FROM `clients` c JOIN `pieces` p ON p.`client_id` = c.`id` AND p.`studio_id` = c.`studio_id` WHERE c.`id` IN (old.`client_id`, new.`client_id`) GROUP BY c.`rowid`;
END;
--> statement-breakpoint
CREATE TRIGGER `client_titles_fts_ad` AFTER DELETE ON `pieces` WHEN old.`client_id` IS NOT NULL BEGIN
	DELETE FROM `client_titles_fts` WHERE `rowid` = (SELECT `rowid` FROM `clients` WHERE `id` = old.`client_id`);
	INSERT INTO `client_titles_fts` (`rowid`, `titles`)
		SELECT c.`rowid`, group_concat(p.`title`, char(10)) FROM `clients` c JOIN `pieces` p ON p.`client_id` = c.`id` AND p.`studio_id` = c.`studio_id` WHERE c.`id` = old.`client_id` GROUP BY c.`rowid`;
END;
