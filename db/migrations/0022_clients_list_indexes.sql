CREATE INDEX `clients_studio_name_nocase_idx` ON `clients` (`studio_id`,"name" COLLATE NOCASE,`id`);--> statement-breakpoint
CREATE INDEX `threads_owner_idx` ON `threads` (`owner_id`,`studio_id`);