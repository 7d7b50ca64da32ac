ALTER TABLE `payments` ADD `refund_reason` text;--> statement-breakpoint
ALTER TABLE `payments` ADD `refund_requested_at` integer;