-- A piece's update re-indexes its client's titles only when the title, client or studio really changed:
-- an edit that writes the same title back (the record form saves every field) no longer rebuilds the
-- client's title row (a delete and an insert in the FTS5 index, with a group_concat of their titles).
DROP TRIGGER IF EXISTS `client_titles_fts_au`;
--> statement-breakpoint
CREATE TRIGGER `client_titles_fts_au` AFTER UPDATE OF `title`, `client_id`, `studio_id` ON `pieces`
	WHEN (old.`client_id` IS NOT NULL OR new.`client_id` IS NOT NULL)
		AND (old.`title` IS NOT new.`title` OR old.`client_id` IS NOT new.`client_id` OR old.`studio_id` IS NOT new.`studio_id`)
BEGIN
	DELETE FROM `client_titles_fts` WHERE `rowid` = (SELECT `rowid` FROM `clients` WHERE `id` = old.`client_id`);
	DELETE FROM `client_titles_fts` WHERE `rowid` = (SELECT `rowid` FROM `clients` WHERE `id` = new.`client_id`);
	INSERT INTO `client_titles_fts` (`rowid`, `titles`)
		SELECT c.`rowid`, group_concat(p.`title`, char(10)) FROM `clients` c JOIN `pieces` p ON p.`client_id` = c.`id` AND p.`studio_id` = c.`studio_id` WHERE c.`id` IN (old.`client_id`, new.`client_id`) GROUP BY c.`rowid`;
END;
