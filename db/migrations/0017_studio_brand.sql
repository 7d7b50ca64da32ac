ALTER TABLE `studios` ADD `logo_key` text;--> statement-breakpoint
ALTER TABLE `studios` ADD `accent` text DEFAULT 'default' NOT NULL;