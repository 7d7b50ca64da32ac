CREATE TABLE `thread_messages` (
	`id` text PRIMARY KEY NOT NULL,
	`studio_id` text NOT NULL,
	`thread_id` text NOT NULL,
	`author` text NOT NULL,
	`author_id` text,
	`source` text DEFAULT 'web' NOT NULL,
	`from_email` text,
	`email_message_id` text,
	`body` text NOT NULL,
	`created_at` integer NOT NULL,
	FOREIGN KEY (`studio_id`) REFERENCES `studios`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`thread_id`) REFERENCES `threads`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`author_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE UNIQUE INDEX `thread_messages_email_message_id_unique` ON `thread_messages` (`email_message_id`);--> statement-breakpoint
CREATE INDEX `thread_messages_thread_idx` ON `thread_messages` (`thread_id`,`created_at`);--> statement-breakpoint
CREATE TABLE `threads` (
	`id` text PRIMARY KEY NOT NULL,
	`studio_id` text NOT NULL,
	`subject` text NOT NULL,
	`claim_id` text,
	`job_id` text,
	`visit_id` text,
	`piece_id` text NOT NULL,
	`owner_id` text,
	`state` text DEFAULT 'open' NOT NULL,
	`assigned_to_id` text,
	`waiting_since` integer,
	`last_message_at` integer NOT NULL,
	`created_at` integer NOT NULL,
	`updated_at` integer NOT NULL,
	FOREIGN KEY (`studio_id`) REFERENCES `studios`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`claim_id`) REFERENCES `claims`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`job_id`) REFERENCES `repair_jobs`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`visit_id`) REFERENCES `visits`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`piece_id`) REFERENCES `pieces`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`owner_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null,
	FOREIGN KEY (`assigned_to_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE INDEX `threads_studio_state_idx` ON `threads` (`studio_id`,`state`,`last_message_at`);--> statement-breakpoint
CREATE INDEX `threads_piece_idx` ON `threads` (`piece_id`);--> statement-breakpoint
CREATE UNIQUE INDEX `threads_claim_uq` ON `threads` (`claim_id`);--> statement-breakpoint
CREATE UNIQUE INDEX `threads_job_uq` ON `threads` (`job_id`);--> statement-breakpoint
CREATE UNIQUE INDEX `threads_visit_uq` ON `threads` (`visit_id`);--> statement-breakpoint
CREATE TABLE `unmatched_mail` (
	`id` text PRIMARY KEY NOT NULL,
	`studio_id` text,
	`thread_id` text,
	`reason` text NOT NULL,
	`email_message_id` text,
	`from_email` text NOT NULL,
	`to_email` text NOT NULL,
	`subject` text NOT NULL,
	`body` text NOT NULL,
	`received_at` integer NOT NULL,
	`resolved_at` integer,
	`resolved_by_id` text,
	FOREIGN KEY (`studio_id`) REFERENCES `studios`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`thread_id`) REFERENCES `threads`(`id`) ON UPDATE no action ON DELETE set null,
	FOREIGN KEY (`resolved_by_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE UNIQUE INDEX `unmatched_mail_email_message_id_unique` ON `unmatched_mail` (`email_message_id`);--> statement-breakpoint
CREATE INDEX `unmatched_mail_studio_idx` ON `unmatched_mail` (`studio_id`,`received_at`);