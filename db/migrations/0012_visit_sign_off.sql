ALTER TABLE `visits` ADD `report_early_reason` text;--> statement-breakpoint
ALTER TABLE `visits` ADD `sign_off_token_hash` text;--> statement-breakpoint
ALTER TABLE `visits` ADD `sign_off_expires_at` integer;--> statement-breakpoint
ALTER TABLE `visits` ADD `signed_off_at` integer;--> statement-breakpoint
ALTER TABLE `visits` ADD `signed_off_by_id` text REFERENCES users(id);--> statement-breakpoint
CREATE UNIQUE INDEX `visits_sign_off_token_hash_unique` ON `visits` (`sign_off_token_hash`);