-- visits.signed_off_by_id was added (0012) as a bare REFERENCES users(id): deleting a user who signed off a
-- visit was refused. SQLite changes a foreign key only by rebuilding the table: a new table with the
-- column's ON DELETE SET NULL, every row copied by column name, the old table dropped, the new one renamed
-- and its indexes made again. db/migrate.ts runs migrations with foreign keys off (the pragma is ignored
-- inside the migration's transaction), so dropping the old table fires no ON DELETE on visit_photos,
-- visit_mail_sends or threads, whose references name `visits` and find the renamed table; it then checks
-- that no reference points nowhere.
PRAGMA foreign_keys=OFF;--> statement-breakpoint
CREATE TABLE `__new_visits` (
	`id` text PRIMARY KEY NOT NULL,
	`studio_id` text NOT NULL,
	`job_id` text NOT NULL,
	`piece_id` text NOT NULL,
	`technician_id` text NOT NULL,
	`start_at` integer NOT NULL,
	`end_at` integer NOT NULL,
	`location_kind` text NOT NULL,
	`location` text NOT NULL,
	`ics_uid` text NOT NULL,
	`sequence` integer DEFAULT 0 NOT NULL,
	`state` text DEFAULT 'booked' NOT NULL,
	`job_state_before` text NOT NULL,
	`booked_by_id` text,
	`cancelled_at` integer,
	`cancelled_by_id` text,
	`cancel_reason` text,
	`report_work` text,
	`report_sign_off_name` text,
	`report_layer_ids` text,
	`reported_at` integer,
	`reported_by_id` text,
	`report_early_reason` text,
	`sign_off_token_hash` text,
	`sign_off_expires_at` integer,
	`signed_off_at` integer,
	`signed_off_by_id` text,
	`last_invite_at` integer,
	`version` integer DEFAULT 0 NOT NULL,
	`created_at` integer NOT NULL,
	`updated_at` integer NOT NULL,
	FOREIGN KEY (`studio_id`) REFERENCES `studios`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`job_id`) REFERENCES `repair_jobs`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`piece_id`) REFERENCES `pieces`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`technician_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE restrict,
	FOREIGN KEY (`booked_by_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null,
	FOREIGN KEY (`cancelled_by_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null,
	FOREIGN KEY (`reported_by_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null,
	FOREIGN KEY (`signed_off_by_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null
);--> statement-breakpoint
INSERT INTO `__new_visits`(`id`, `studio_id`, `job_id`, `piece_id`, `technician_id`, `start_at`, `end_at`, `location_kind`, `location`, `ics_uid`, `sequence`, `state`, `job_state_before`, `booked_by_id`, `cancelled_at`, `cancelled_by_id`, `cancel_reason`, `report_work`, `report_sign_off_name`, `report_layer_ids`, `reported_at`, `reported_by_id`, `report_early_reason`, `sign_off_token_hash`, `sign_off_expires_at`, `signed_off_at`, `signed_off_by_id`, `last_invite_at`, `version`, `created_at`, `updated_at`) SELECT `id`, `studio_id`, `job_id`, `piece_id`, `technician_id`, `start_at`, `end_at`, `location_kind`, `location`, `ics_uid`, `sequence`, `state`, `job_state_before`, `booked_by_id`, `cancelled_at`, `cancelled_by_id`, `cancel_reason`, `report_work`, `report_sign_off_name`, `report_layer_ids`, `reported_at`, `reported_by_id`, `report_early_reason`, `sign_off_token_hash`, `sign_off_expires_at`, `signed_off_at`, `signed_off_by_id`, `last_invite_at`, `version`, `created_at`, `updated_at` FROM `visits`;--> statement-breakpoint
DROP TABLE `visits`;--> statement-breakpoint
ALTER TABLE `__new_visits` RENAME TO `visits`;--> statement-breakpoint
PRAGMA foreign_keys=ON;--> statement-breakpoint
CREATE UNIQUE INDEX `visits_ics_uid_unique` ON `visits` (`ics_uid`);--> statement-breakpoint
CREATE UNIQUE INDEX `visits_sign_off_token_hash_unique` ON `visits` (`sign_off_token_hash`);--> statement-breakpoint
CREATE INDEX `visits_studio_tech_start_idx` ON `visits` (`studio_id`,`technician_id`,`start_at`);--> statement-breakpoint
CREATE INDEX `visits_studio_start_idx` ON `visits` (`studio_id`,`start_at`);--> statement-breakpoint
CREATE INDEX `visits_job_idx` ON `visits` (`job_id`);--> statement-breakpoint
CREATE UNIQUE INDEX `visits_job_booked_uq` ON `visits` (`job_id`) WHERE state = 'booked';
