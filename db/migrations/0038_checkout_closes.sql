-- Payment pages to close at Stripe after their piece changed hands, retried by jobs/checkout-closes.ts until Stripe confirms or the page expires.
CREATE TABLE `checkout_closes` (
	`id` text PRIMARY KEY NOT NULL,
	`studio_id` text NOT NULL,
	`payment_id` text NOT NULL,
	`expires_at` integer NOT NULL,
	`tries` integer DEFAULT 0 NOT NULL,
	`last_tried_at` integer,
	`outcome` text,
	`settled_at` integer,
	`created_at` integer NOT NULL,
	FOREIGN KEY (`studio_id`) REFERENCES `studios`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`payment_id`) REFERENCES `payments`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE UNIQUE INDEX `checkout_closes_payment_uq` ON `checkout_closes` (`payment_id`);--> statement-breakpoint
CREATE INDEX `checkout_closes_studio_idx` ON `checkout_closes` (`studio_id`,`created_at`);--> statement-breakpoint
CREATE INDEX `checkout_closes_due_idx` ON `checkout_closes` (`created_at`) WHERE settled_at IS NULL;