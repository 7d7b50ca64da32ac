ALTER TABLE `payments` ADD `stripe_account` text;--> statement-breakpoint
ALTER TABLE `plan_subscriptions` ADD `stripe_account` text;--> statement-breakpoint
ALTER TABLE `plan_subscriptions` ADD `transfer_step` text;