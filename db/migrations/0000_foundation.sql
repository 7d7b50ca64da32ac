CREATE TABLE `audit_log` (
	`id` text PRIMARY KEY NOT NULL,
	`studio_id` text,
	`actor_id` text,
	`action` text NOT NULL,
	`subject_type` text NOT NULL,
	`subject_id` text NOT NULL,
	`data` text DEFAULT '{}' NOT NULL,
	`created_at` integer NOT NULL,
	FOREIGN KEY (`studio_id`) REFERENCES `studios`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`actor_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE INDEX `audit_log_studio_idx` ON `audit_log` (`studio_id`,`created_at`);--> statement-breakpoint
CREATE INDEX `audit_log_subject_idx` ON `audit_log` (`subject_type`,`subject_id`);--> statement-breakpoint
CREATE TABLE `finish_layers` (
	`id` text PRIMARY KEY NOT NULL,
	`studio_id` text NOT NULL,
	`piece_id` text NOT NULL,
	`surface` text NOT NULL,
	`position` integer NOT NULL,
	`finish_class` text NOT NULL,
	`product_id` text,
	`product_label` text DEFAULT '' NOT NULL,
	`coats` integer NOT NULL,
	`applied_on` text NOT NULL,
	`applied_by_id` text,
	`batch_lot` text DEFAULT '' NOT NULL,
	`notes` text DEFAULT '' NOT NULL,
	`created_at` integer NOT NULL,
	FOREIGN KEY (`studio_id`) REFERENCES `studios`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`piece_id`) REFERENCES `pieces`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`product_id`) REFERENCES `finish_products`(`id`) ON UPDATE no action ON DELETE set null,
	FOREIGN KEY (`applied_by_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE INDEX `finish_layers_piece_idx` ON `finish_layers` (`piece_id`,`surface`,`position`);--> statement-breakpoint
CREATE TABLE `finish_products` (
	`id` text PRIMARY KEY NOT NULL,
	`studio_id` text NOT NULL,
	`name` text NOT NULL,
	`finish_class` text NOT NULL,
	`coverage_m2_per_l` real NOT NULL,
	`containers` text DEFAULT '[]' NOT NULL,
	`interval_heavy_months` integer,
	`interval_moderate_months` integer,
	`interval_light_months` integer,
	`safety_notes` text DEFAULT '' NOT NULL,
	`archived_at` integer,
	`created_at` integer NOT NULL,
	FOREIGN KEY (`studio_id`) REFERENCES `studios`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE INDEX `finish_products_studio_idx` ON `finish_products` (`studio_id`);--> statement-breakpoint
CREATE TABLE `invitations` (
	`id` text PRIMARY KEY NOT NULL,
	`studio_id` text NOT NULL,
	`email` text NOT NULL,
	`role` text NOT NULL,
	`token_hash` text NOT NULL,
	`invited_by_id` text,
	`expires_at` integer NOT NULL,
	`accepted_at` integer,
	`revoked_at` integer,
	`created_at` integer NOT NULL,
	FOREIGN KEY (`studio_id`) REFERENCES `studios`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`invited_by_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE UNIQUE INDEX `invitations_token_hash_unique` ON `invitations` (`token_hash`);--> statement-breakpoint
CREATE INDEX `invitations_studio_idx` ON `invitations` (`studio_id`);--> statement-breakpoint
CREATE TABLE `memberships` (
	`id` text PRIMARY KEY NOT NULL,
	`studio_id` text NOT NULL,
	`user_id` text NOT NULL,
	`role` text NOT NULL,
	`created_at` integer NOT NULL,
	FOREIGN KEY (`studio_id`) REFERENCES `studios`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE UNIQUE INDEX `memberships_studio_user_uq` ON `memberships` (`studio_id`,`user_id`);--> statement-breakpoint
CREATE INDEX `memberships_user_idx` ON `memberships` (`user_id`);--> statement-breakpoint
CREATE TABLE `pieces` (
	`id` text PRIMARY KEY NOT NULL,
	`studio_id` text NOT NULL,
	`kind` text NOT NULL,
	`title` text NOT NULL,
	`shape_kind` text NOT NULL,
	`length_mm` integer,
	`width_mm` integer,
	`diameter_mm` integer,
	`measured_area_m2` real,
	`thickness_mm` integer,
	`primary_species_id` text NOT NULL,
	`secondary_species_id` text,
	`resin_kind` text DEFAULT 'none' NOT NULL,
	`resin_poured_on` text,
	`resin_volume_ml` integer,
	`resin_tint` text,
	`base_material` text DEFAULT '' NOT NULL,
	`base_finish` text DEFAULT '' NOT NULL,
	`use` text NOT NULL,
	`sun` text DEFAULT 'none' NOT NULL,
	`delivered_on` text NOT NULL,
	`delivery_address` text DEFAULT '' NOT NULL,
	`internal_notes` text DEFAULT '' NOT NULL,
	`owner_id` text,
	`registered_at` integer,
	`registration_code_hash` text NOT NULL,
	`registration_code_enc` text NOT NULL,
	`reminders_paused` integer DEFAULT false NOT NULL,
	`archived_at` integer,
	`created_at` integer NOT NULL,
	`updated_at` integer NOT NULL,
	FOREIGN KEY (`studio_id`) REFERENCES `studios`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`owner_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE UNIQUE INDEX `pieces_registration_code_hash_unique` ON `pieces` (`registration_code_hash`);--> statement-breakpoint
CREATE INDEX `pieces_studio_idx` ON `pieces` (`studio_id`,`delivered_on`);--> statement-breakpoint
CREATE INDEX `pieces_owner_idx` ON `pieces` (`owner_id`);--> statement-breakpoint
CREATE TABLE `sessions` (
	`id` text PRIMARY KEY NOT NULL,
	`user_id` text NOT NULL,
	`expires_at` integer NOT NULL,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE INDEX `sessions_user_idx` ON `sessions` (`user_id`);--> statement-breakpoint
CREATE TABLE `studios` (
	`id` text PRIMARY KEY NOT NULL,
	`slug` text NOT NULL,
	`name` text NOT NULL,
	`address` text DEFAULT '' NOT NULL,
	`email` text DEFAULT '' NOT NULL,
	`time_zone` text DEFAULT 'UTC' NOT NULL,
	`currency` text DEFAULT 'USD' NOT NULL,
	`unit_system` text DEFAULT 'metric' NOT NULL,
	`tax_rate_bp` integer DEFAULT 0 NOT NULL,
	`labour_rate_minor` integer DEFAULT 0 NOT NULL,
	`travel_fee_minor` integer DEFAULT 0 NOT NULL,
	`created_at` integer NOT NULL
);
--> statement-breakpoint
CREATE UNIQUE INDEX `studios_slug_unique` ON `studios` (`slug`);--> statement-breakpoint
CREATE TABLE `user_tokens` (
	`id` text PRIMARY KEY NOT NULL,
	`user_id` text NOT NULL,
	`purpose` text NOT NULL,
	`token_hash` text NOT NULL,
	`expires_at` integer NOT NULL,
	`used_at` integer,
	`created_at` integer NOT NULL,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE UNIQUE INDEX `user_tokens_token_hash_unique` ON `user_tokens` (`token_hash`);--> statement-breakpoint
CREATE INDEX `user_tokens_user_idx` ON `user_tokens` (`user_id`,`purpose`);--> statement-breakpoint
CREATE TABLE `users` (
	`id` text PRIMARY KEY NOT NULL,
	`email` text NOT NULL,
	`name` text NOT NULL,
	`password_hash` text NOT NULL,
	`email_verified_at` integer,
	`time_zone` text DEFAULT 'UTC' NOT NULL,
	`unit_system` text DEFAULT 'metric' NOT NULL,
	`reminders_enabled` integer DEFAULT true NOT NULL,
	`created_at` integer NOT NULL
);
--> statement-breakpoint
CREATE UNIQUE INDEX `users_email_unique` ON `users` (`email`);