ALTER TABLE `plan_invoices` ADD `held_resolution` text;--> statement-breakpoint
ALTER TABLE `plan_invoices` ADD `held_refunded_minor` integer DEFAULT 0 NOT NULL;--> statement-breakpoint
ALTER TABLE `plan_invoices` ADD `held_resolved_at` integer;--> statement-breakpoint
ALTER TABLE `plan_invoices` ADD `held_resolved_by_id` text REFERENCES users(id);