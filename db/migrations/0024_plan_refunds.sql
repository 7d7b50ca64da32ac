CREATE TABLE `plan_refunds` (
	`id` text PRIMARY KEY NOT NULL,
	`studio_id` text NOT NULL,
	`subscription_id` text NOT NULL,
	`subscription_version` integer NOT NULL,
	`amount_minor` integer NOT NULL,
	`currency` text NOT NULL,
	`months` integer NOT NULL,
	`reason` text NOT NULL,
	`status` text DEFAULT 'requested' NOT NULL,
	`stripe_refund_id` text,
	`requested_by_id` text,
	`refunded_at` integer,
	`created_at` integer NOT NULL,
	FOREIGN KEY (`studio_id`) REFERENCES `studios`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`subscription_id`) REFERENCES `plan_subscriptions`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`requested_by_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE UNIQUE INDEX `plan_refunds_subscription_id_unique` ON `plan_refunds` (`subscription_id`);--> statement-breakpoint
CREATE INDEX `plan_refunds_studio_idx` ON `plan_refunds` (`studio_id`);--> statement-breakpoint
ALTER TABLE `plan_subscriptions` ADD `ends_at` integer;