CREATE TABLE `plan_invoices` (
	`id` text PRIMARY KEY NOT NULL,
	`studio_id` text NOT NULL,
	`subscription_id` text NOT NULL,
	`stripe_invoice_id` text,
	`status` text NOT NULL,
	`amount_minor` integer NOT NULL,
	`tax_minor` integer DEFAULT 0 NOT NULL,
	`currency` text NOT NULL,
	`counts` integer DEFAULT true NOT NULL,
	`period_start` integer,
	`period_end` integer,
	`at` integer NOT NULL,
	`created_at` integer NOT NULL,
	FOREIGN KEY (`studio_id`) REFERENCES `studios`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`subscription_id`) REFERENCES `plan_subscriptions`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE UNIQUE INDEX `plan_invoices_stripe_invoice_id_unique` ON `plan_invoices` (`stripe_invoice_id`);--> statement-breakpoint
CREATE INDEX `plan_invoices_studio_idx` ON `plan_invoices` (`studio_id`,`at`);--> statement-breakpoint
CREATE INDEX `plan_invoices_subscription_idx` ON `plan_invoices` (`subscription_id`);--> statement-breakpoint
CREATE TABLE `plan_subscriptions` (
	`id` text PRIMARY KEY NOT NULL,
	`studio_id` text NOT NULL,
	`template_id` text NOT NULL,
	`piece_id` text NOT NULL,
	`owner_id` text,
	`state` text DEFAULT 'awaiting_payment' NOT NULL,
	`paid_by` text DEFAULT 'card' NOT NULL,
	`paid_by_note` text DEFAULT '' NOT NULL,
	`stripe_customer_id` text,
	`stripe_subscription_id` text,
	`checkout_session_id` text,
	`checkout_url` text,
	`amount_minor` integer NOT NULL,
	`currency` text NOT NULL,
	`period_start` integer,
	`period_end` integer,
	`grace_ends_at` integer,
	`started_at` integer,
	`lapsed_at` integer,
	`ended_at` integer,
	`created_by_id` text,
	`version` integer DEFAULT 0 NOT NULL,
	`created_at` integer NOT NULL,
	`updated_at` integer NOT NULL,
	FOREIGN KEY (`studio_id`) REFERENCES `studios`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`template_id`) REFERENCES `plan_templates`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`piece_id`) REFERENCES `pieces`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`owner_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null,
	FOREIGN KEY (`created_by_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE UNIQUE INDEX `plan_subscriptions_stripe_subscription_id_unique` ON `plan_subscriptions` (`stripe_subscription_id`);--> statement-breakpoint
CREATE UNIQUE INDEX `plan_subscriptions_checkout_session_id_unique` ON `plan_subscriptions` (`checkout_session_id`);--> statement-breakpoint
CREATE INDEX `plan_subscriptions_studio_idx` ON `plan_subscriptions` (`studio_id`,`state`);--> statement-breakpoint
CREATE INDEX `plan_subscriptions_piece_idx` ON `plan_subscriptions` (`piece_id`);--> statement-breakpoint
CREATE INDEX `plan_subscriptions_owner_idx` ON `plan_subscriptions` (`owner_id`);--> statement-breakpoint
CREATE TABLE `plan_templates` (
	`id` text PRIMARY KEY NOT NULL,
	`studio_id` text NOT NULL,
	`lineage_id` text NOT NULL,
	`version` integer DEFAULT 1 NOT NULL,
	`name` text NOT NULL,
	`summary` text DEFAULT '' NOT NULL,
	`included` text NOT NULL,
	`fits` text NOT NULL,
	`price_minor` integer NOT NULL,
	`interval` text DEFAULT 'year' NOT NULL,
	`currency` text NOT NULL,
	`refund_rule` text DEFAULT 'none' NOT NULL,
	`transfers` integer DEFAULT false NOT NULL,
	`offered` integer DEFAULT true NOT NULL,
	`superseded_at` integer,
	`created_by_id` text,
	`created_at` integer NOT NULL,
	FOREIGN KEY (`studio_id`) REFERENCES `studios`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`created_by_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE UNIQUE INDEX `plan_templates_lineage_version_uq` ON `plan_templates` (`lineage_id`,`version`);--> statement-breakpoint
CREATE INDEX `plan_templates_studio_idx` ON `plan_templates` (`studio_id`);--> statement-breakpoint
CREATE TABLE `plan_visits` (
	`id` text PRIMARY KEY NOT NULL,
	`studio_id` text NOT NULL,
	`subscription_id` text NOT NULL,
	`due_on` text NOT NULL,
	`job_id` text,
	`created_at` integer NOT NULL,
	FOREIGN KEY (`studio_id`) REFERENCES `studios`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`subscription_id`) REFERENCES `plan_subscriptions`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`job_id`) REFERENCES `repair_jobs`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE UNIQUE INDEX `plan_visits_subscription_due_uq` ON `plan_visits` (`subscription_id`,`due_on`);--> statement-breakpoint
CREATE INDEX `plan_visits_studio_idx` ON `plan_visits` (`studio_id`);