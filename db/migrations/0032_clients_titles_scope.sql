-- The clients' title index (client_titles_fts, migration 0025) gains a first column, `scope`: the client's
-- studio word, the word searchScope in lib/pieces/search-index.ts gives a studio's live pieces
-- ('s' + the studio id's UTF-8 bytes in hex + 'live'). A search's capped count then takes a title word's
-- matches in the caller's studio from the index alone (`scope : "<word>" AND titles : (...)`,
-- lib/clients/list.ts, searchRowids) instead of reading each match's client for its studio.
-- First column, as in pieces_fts (migration 0031): its entries need no column number.
-- The row is rebuilt from the client's pieces, as before, and kept right by the triggers below: a piece
-- added, retitled, moved to another client or studio, or deleted (0025, 0026, now with the word), a
-- client moved to another studio (new: its row is rebuilt with the new word and the pieces it now joins),
-- a client deleted (clients_fts_ad, 0025, unchanged).
DROP TRIGGER IF EXISTS `client_titles_fts_ai`;
--> statement-breakpoint
DROP TRIGGER IF EXISTS `client_titles_fts_au`;
--> statement-breakpoint
DROP TRIGGER IF EXISTS `client_titles_fts_ad`;
--> statement-breakpoint
DROP TABLE `client_titles_fts`;
--> statement-breakpoint
CREATE VIRTUAL TABLE `client_titles_fts` USING fts5(
	`scope`,
	`titles`,
	tokenize = 'unicode61 remove_diacritics 2',
	prefix = '2 3 4 5 6 7 8'
);
--> statement-breakpoint
INSERT INTO `client_titles_fts` (`rowid`, `scope`, `titles`)
	SELECT c.`rowid`, 's' || lower(hex(c.`studio_id`)) || 'live', group_concat(p.`title`, char(10))
	FROM `clients` c JOIN `pieces` p ON p.`client_id` = c.`id` AND p.`studio_id` = c.`studio_id` GROUP BY c.`rowid`;
--> statement-breakpoint
INSERT INTO `client_titles_fts` (`client_titles_fts`) VALUES ('optimize');
--> statement-breakpoint
CREATE TRIGGER `client_titles_fts_ai` AFTER INSERT ON `pieces` WHEN new.`client_id` IS NOT NULL BEGIN
	DELETE FROM `client_titles_fts` WHERE `rowid` = (SELECT `rowid` FROM `clients` WHERE `id` = new.`client_id`);
	INSERT INTO `client_titles_fts` (`rowid`, `scope`, `titles`)
		SELECT c.`rowid`, 's' || lower(hex(c.`studio_id`)) || 'live', group_concat(p.`title`, char(10))
		FROM `clients` c JOIN `pieces` p ON p.`client_id` = c.`id` AND p.`studio_id` = c.`studio_id` WHERE c.`id` = new.`client_id` GROUP BY c.`rowid`;
END;
--> statement-breakpoint
CREATE TRIGGER `client_titles_fts_au` AFTER UPDATE OF `title`, `client_id`, `studio_id` ON `pieces`
	WHEN (old.`client_id` IS NOT NULL OR new.`client_id` IS NOT NULL)
		AND (old.`title` IS NOT new.`title` OR old.`client_id` IS NOT new.`client_id` OR old.`studio_id` IS NOT new.`studio_id`)
BEGIN
	DELETE FROM `client_titles_fts` WHERE `rowid` = (SELECT `rowid` FROM `clients` WHERE `id` = old.`client_id`);
	DELETE FROM `client_titles_fts` WHERE `rowid` = (SELECT `rowid` FROM `clients` WHERE `id` = new.`client_id`);
	INSERT INTO `client_titles_fts` (`rowid`, `scope`, `titles`)
		SELECT c.`rowid`, 's' || lower(hex(c.`studio_id`)) || 'live', group_concat(p.`title`, char(10))
		FROM `clients` c JOIN `pieces` p ON p.`client_id` = c.`id` AND p.`studio_id` = c.`studio_id` WHERE c.`id` IN (old.`client_id`, new.`client_id`) GROUP BY c.`rowid`;
END;
--> statement-breakpoint
CREATE TRIGGER `client_titles_fts_ad` AFTER DELETE ON `pieces` WHEN old.`client_id` IS NOT NULL BEGIN
	DELETE FROM `client_titles_fts` WHERE `rowid` = (SELECT `rowid` FROM `clients` WHERE `id` = old.`client_id`);
	INSERT INTO `client_titles_fts` (`rowid`, `scope`, `titles`)
		SELECT c.`rowid`, 's' || lower(hex(c.`studio_id`)) || 'live', group_concat(p.`title`, char(10))
		FROM `clients` c JOIN `pieces` p ON p.`client_id` = c.`id` AND p.`studio_id` = c.`studio_id` WHERE c.`id` = old.`client_id` GROUP BY c.`rowid`;
END;
--> statement-breakpoint
CREATE TRIGGER `client_titles_fts_studio_au` AFTER UPDATE OF `studio_id` ON `clients` WHEN old.`studio_id` IS NOT new.`studio_id` BEGIN
	DELETE FROM `client_titles_fts` WHERE `rowid` = new.`rowid`;
	INSERT INTO `client_titles_fts` (`rowid`, `scope`, `titles`)
		SELECT c.`rowid`, 's' || lower(hex(c.`studio_id`)) || 'live', group_concat(p.`title`, char(10))
		FROM `clients` c JOIN `pieces` p ON p.`client_id` = c.`id` AND p.`studio_id` = c.`studio_id` WHERE c.`rowid` = new.`rowid` GROUP BY c.`rowid`;
END;
