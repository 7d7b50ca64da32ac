CREATE TABLE `payments` (
	`id` text PRIMARY KEY NOT NULL,
	`studio_id` text NOT NULL,
	`job_id` text NOT NULL,
	`quote_version` integer NOT NULL,
	`checkout_session_id` text NOT NULL,
	`checkout_url` text,
	`amount_minor` integer NOT NULL,
	`currency` text NOT NULL,
	`status` text DEFAULT 'open' NOT NULL,
	`payment_intent_id` text,
	`refunded_minor` integer DEFAULT 0 NOT NULL,
	`paid_at` integer,
	`created_at` integer NOT NULL,
	`updated_at` integer NOT NULL,
	FOREIGN KEY (`studio_id`) REFERENCES `studios`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`job_id`) REFERENCES `repair_jobs`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE UNIQUE INDEX `payments_checkout_session_id_unique` ON `payments` (`checkout_session_id`);--> statement-breakpoint
CREATE INDEX `payments_job_idx` ON `payments` (`job_id`);--> statement-breakpoint
CREATE TABLE `repair_jobs` (
	`id` text PRIMARY KEY NOT NULL,
	`studio_id` text NOT NULL,
	`piece_id` text NOT NULL,
	`owner_id` text,
	`origin` text NOT NULL,
	`claim_id` text,
	`refresh_offer_id` text,
	`state` text DEFAULT 'draft' NOT NULL,
	`title` text NOT NULL,
	`quote_input` text NOT NULL,
	`lines` text NOT NULL,
	`currency` text NOT NULL,
	`covered_pct` integer DEFAULT 0 NOT NULL,
	`subtotal_minor` integer DEFAULT 0 NOT NULL,
	`covered_minor` integer DEFAULT 0 NOT NULL,
	`tax_minor` integer DEFAULT 0 NOT NULL,
	`total_minor` integer DEFAULT 0 NOT NULL,
	`quote_version` integer DEFAULT 0 NOT NULL,
	`notes` text DEFAULT '' NOT NULL,
	`quoted_at` integer,
	`approved_at` integer,
	`paid_at` integer,
	`done_at` integer,
	`cancelled_at` integer,
	`created_by_id` text,
	`version` integer DEFAULT 0 NOT NULL,
	`created_at` integer NOT NULL,
	`updated_at` integer NOT NULL,
	FOREIGN KEY (`studio_id`) REFERENCES `studios`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`piece_id`) REFERENCES `pieces`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`owner_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null,
	FOREIGN KEY (`claim_id`) REFERENCES `claims`(`id`) ON UPDATE no action ON DELETE set null,
	FOREIGN KEY (`refresh_offer_id`) REFERENCES `refresh_offers`(`id`) ON UPDATE no action ON DELETE set null,
	FOREIGN KEY (`created_by_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE INDEX `repair_jobs_studio_idx` ON `repair_jobs` (`studio_id`,`state`);--> statement-breakpoint
CREATE INDEX `repair_jobs_owner_idx` ON `repair_jobs` (`owner_id`);--> statement-breakpoint
CREATE INDEX `repair_jobs_piece_idx` ON `repair_jobs` (`piece_id`);--> statement-breakpoint
CREATE TABLE `stripe_events` (
	`id` text PRIMARY KEY NOT NULL,
	`type` text NOT NULL,
	`object_id` text,
	`received_at` integer NOT NULL
);
