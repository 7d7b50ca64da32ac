ALTER TABLE `studios` ADD `phone` text DEFAULT '' NOT NULL;--> statement-breakpoint
ALTER TABLE `studios` ADD `mail_sender_name` text DEFAULT '' NOT NULL;--> statement-breakpoint
ALTER TABLE `studios` ADD `stripe_secret_sealed` text;--> statement-breakpoint
ALTER TABLE `studios` ADD `stripe_checked_at` integer;--> statement-breakpoint
ALTER TABLE `studios` ADD `setup_done` text DEFAULT '[]' NOT NULL;