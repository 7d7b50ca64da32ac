CREATE TABLE `technician_hours` (
	`id` text PRIMARY KEY NOT NULL,
	`studio_id` text NOT NULL,
	`user_id` text NOT NULL,
	`weekday` integer NOT NULL,
	`start` text NOT NULL,
	`end` text NOT NULL,
	FOREIGN KEY (`studio_id`) REFERENCES `studios`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE INDEX `technician_hours_studio_user_idx` ON `technician_hours` (`studio_id`,`user_id`);--> statement-breakpoint
CREATE TABLE `technician_time_off` (
	`id` text PRIMARY KEY NOT NULL,
	`studio_id` text NOT NULL,
	`user_id` text NOT NULL,
	`date` text NOT NULL,
	`start` text,
	`end` text,
	`note` text DEFAULT '' NOT NULL,
	`created_at` integer NOT NULL,
	FOREIGN KEY (`studio_id`) REFERENCES `studios`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE INDEX `technician_time_off_studio_user_idx` ON `technician_time_off` (`studio_id`,`user_id`,`date`);--> statement-breakpoint
CREATE TABLE `visit_mail_sends` (
	`id` text PRIMARY KEY NOT NULL,
	`studio_id` text NOT NULL,
	`visit_id` text NOT NULL,
	`kind` text NOT NULL,
	`sequence` integer NOT NULL,
	`status` text NOT NULL,
	`attempts` integer DEFAULT 0 NOT NULL,
	`last_error` text,
	`claimed_at` integer NOT NULL,
	`sent_at` integer,
	`message_id` text,
	FOREIGN KEY (`studio_id`) REFERENCES `studios`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`visit_id`) REFERENCES `visits`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE UNIQUE INDEX `visit_mail_sends_uq` ON `visit_mail_sends` (`visit_id`,`kind`,`sequence`);--> statement-breakpoint
CREATE INDEX `visit_mail_sends_studio_idx` ON `visit_mail_sends` (`studio_id`,`status`);--> statement-breakpoint
CREATE TABLE `visit_photos` (
	`id` text PRIMARY KEY NOT NULL,
	`studio_id` text NOT NULL,
	`visit_id` text NOT NULL,
	`file_id` text NOT NULL,
	`kind` text NOT NULL,
	`created_at` integer NOT NULL,
	FOREIGN KEY (`studio_id`) REFERENCES `studios`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`visit_id`) REFERENCES `visits`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`file_id`) REFERENCES `files`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE INDEX `visit_photos_visit_idx` ON `visit_photos` (`visit_id`);--> statement-breakpoint
CREATE TABLE `visit_rules` (
	`studio_id` text PRIMARY KEY NOT NULL,
	`travel_buffer_min` integer DEFAULT 30 NOT NULL,
	`lead_time_hours` integer DEFAULT 48 NOT NULL,
	`slot_step_min` integer DEFAULT 30 NOT NULL,
	`owner_change_cutoff_hours` integer DEFAULT 24 NOT NULL,
	FOREIGN KEY (`studio_id`) REFERENCES `studios`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE TABLE `visits` (
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
	FOREIGN KEY (`reported_by_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE UNIQUE INDEX `visits_ics_uid_unique` ON `visits` (`ics_uid`);--> statement-breakpoint
CREATE INDEX `visits_studio_tech_start_idx` ON `visits` (`studio_id`,`technician_id`,`start_at`);--> statement-breakpoint
CREATE INDEX `visits_studio_start_idx` ON `visits` (`studio_id`,`start_at`);--> statement-breakpoint
CREATE INDEX `visits_job_idx` ON `visits` (`job_id`);--> statement-breakpoint
CREATE UNIQUE INDEX `visits_job_booked_uq` ON `visits` (`job_id`) WHERE state = 'booked';