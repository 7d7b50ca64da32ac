CREATE TABLE `care_log_entries` (
	`id` text PRIMARY KEY NOT NULL,
	`studio_id` text NOT NULL,
	`piece_id` text NOT NULL,
	`user_id` text,
	`source` text NOT NULL,
	`task_kind` text NOT NULL,
	`surface` text,
	`done_on` text NOT NULL,
	`product_used` text DEFAULT '' NOT NULL,
	`notes` text DEFAULT '' NOT NULL,
	`photo_file_id` text,
	`created_at` integer NOT NULL,
	`updated_at` integer NOT NULL,
	FOREIGN KEY (`studio_id`) REFERENCES `studios`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`piece_id`) REFERENCES `pieces`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null,
	FOREIGN KEY (`photo_file_id`) REFERENCES `files`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE INDEX `care_log_piece_idx` ON `care_log_entries` (`piece_id`,`done_on`);--> statement-breakpoint
CREATE TABLE `claim_messages` (
	`id` text PRIMARY KEY NOT NULL,
	`studio_id` text NOT NULL,
	`claim_id` text NOT NULL,
	`author_id` text,
	`from_studio` integer NOT NULL,
	`body` text NOT NULL,
	`created_at` integer NOT NULL,
	FOREIGN KEY (`studio_id`) REFERENCES `studios`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`claim_id`) REFERENCES `claims`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`author_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE INDEX `claim_messages_claim_idx` ON `claim_messages` (`claim_id`,`created_at`);--> statement-breakpoint
CREATE TABLE `claims` (
	`id` text PRIMARY KEY NOT NULL,
	`studio_id` text NOT NULL,
	`piece_id` text NOT NULL,
	`owner_id` text NOT NULL,
	`category` text NOT NULL,
	`noticed_on` text NOT NULL,
	`description` text NOT NULL,
	`answers` text NOT NULL,
	`state` text DEFAULT 'submitted' NOT NULL,
	`decision` text,
	`covered_pct` integer,
	`decision_reason` text,
	`suggestion` text,
	`first_answered_at` integer,
	`decided_at` integer,
	`decided_by_id` text,
	`version` integer DEFAULT 0 NOT NULL,
	`created_at` integer NOT NULL,
	`updated_at` integer NOT NULL,
	FOREIGN KEY (`studio_id`) REFERENCES `studios`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`piece_id`) REFERENCES `pieces`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`owner_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`decided_by_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE INDEX `claims_studio_idx` ON `claims` (`studio_id`,`state`,`created_at`);--> statement-breakpoint
CREATE INDEX `claims_owner_idx` ON `claims` (`owner_id`);--> statement-breakpoint
CREATE INDEX `claims_piece_idx` ON `claims` (`piece_id`);--> statement-breakpoint
CREATE TABLE `files` (
	`id` text PRIMARY KEY NOT NULL,
	`studio_id` text NOT NULL,
	`purpose` text NOT NULL,
	`piece_id` text,
	`claim_id` text,
	`storage_key` text NOT NULL,
	`thumb_key` text NOT NULL,
	`content_type` text NOT NULL,
	`width` integer NOT NULL,
	`height` integer NOT NULL,
	`bytes` integer NOT NULL,
	`uploaded_by_id` text,
	`created_at` integer NOT NULL,
	FOREIGN KEY (`studio_id`) REFERENCES `studios`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`piece_id`) REFERENCES `pieces`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`claim_id`) REFERENCES `claims`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`uploaded_by_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE UNIQUE INDEX `files_storage_key_unique` ON `files` (`storage_key`);--> statement-breakpoint
CREATE INDEX `files_piece_idx` ON `files` (`piece_id`);--> statement-breakpoint
CREATE INDEX `files_claim_idx` ON `files` (`claim_id`);--> statement-breakpoint
CREATE TABLE `ownerships` (
	`id` text PRIMARY KEY NOT NULL,
	`studio_id` text NOT NULL,
	`piece_id` text NOT NULL,
	`user_id` text NOT NULL,
	`via` text NOT NULL,
	`started_at` integer NOT NULL,
	`ended_at` integer,
	FOREIGN KEY (`studio_id`) REFERENCES `studios`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`piece_id`) REFERENCES `pieces`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE INDEX `ownerships_piece_idx` ON `ownerships` (`piece_id`);--> statement-breakpoint
CREATE INDEX `ownerships_user_idx` ON `ownerships` (`user_id`);--> statement-breakpoint
CREATE TABLE `refresh_offers` (
	`id` text PRIMARY KEY NOT NULL,
	`studio_id` text NOT NULL,
	`piece_id` text NOT NULL,
	`user_id` text NOT NULL,
	`task_key` text NOT NULL,
	`due_on` text NOT NULL,
	`price_minor` integer NOT NULL,
	`currency` text NOT NULL,
	`quote` text NOT NULL,
	`status` text DEFAULT 'offered' NOT NULL,
	`reminder_send_id` text,
	`accepted_at` integer,
	`created_at` integer NOT NULL,
	FOREIGN KEY (`studio_id`) REFERENCES `studios`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`piece_id`) REFERENCES `pieces`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`reminder_send_id`) REFERENCES `reminder_sends`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE UNIQUE INDEX `refresh_offers_task_due_uq` ON `refresh_offers` (`task_key`,`due_on`);--> statement-breakpoint
CREATE INDEX `refresh_offers_studio_idx` ON `refresh_offers` (`studio_id`,`status`);--> statement-breakpoint
CREATE TABLE `reminder_sends` (
	`id` text PRIMARY KEY NOT NULL,
	`studio_id` text NOT NULL,
	`piece_id` text NOT NULL,
	`user_id` text NOT NULL,
	`reminder_key` text NOT NULL,
	`task_key` text NOT NULL,
	`task_kind` text NOT NULL,
	`step` text NOT NULL,
	`due_on` text NOT NULL,
	`status` text NOT NULL,
	`attempts` integer DEFAULT 0 NOT NULL,
	`last_error` text,
	`next_attempt_at` integer,
	`message_id` text,
	`sent_at` integer,
	`created_at` integer NOT NULL,
	`updated_at` integer NOT NULL,
	FOREIGN KEY (`studio_id`) REFERENCES `studios`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`piece_id`) REFERENCES `pieces`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE UNIQUE INDEX `reminder_sends_reminder_key_unique` ON `reminder_sends` (`reminder_key`);--> statement-breakpoint
CREATE INDEX `reminder_sends_studio_idx` ON `reminder_sends` (`studio_id`,`status`,`due_on`);--> statement-breakpoint
CREATE INDEX `reminder_sends_piece_idx` ON `reminder_sends` (`piece_id`);--> statement-breakpoint
CREATE TABLE `warranty_policies` (
	`id` text PRIMARY KEY NOT NULL,
	`studio_id` text NOT NULL,
	`version` integer NOT NULL,
	`effective_from` text NOT NULL,
	`policy` text NOT NULL,
	`created_by_id` text,
	`created_at` integer NOT NULL,
	FOREIGN KEY (`studio_id`) REFERENCES `studios`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`created_by_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE UNIQUE INDEX `warranty_policies_studio_version_uq` ON `warranty_policies` (`studio_id`,`version`);--> statement-breakpoint
ALTER TABLE `pieces` ADD `warranty_policy_id` text REFERENCES warranty_policies(id);