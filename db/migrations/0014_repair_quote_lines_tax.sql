ALTER TABLE `repair_jobs` ADD `proposed_lines` text DEFAULT '[]' NOT NULL;--> statement-breakpoint
ALTER TABLE `repair_jobs` ADD `pricing_rules` text DEFAULT '{}' NOT NULL;--> statement-breakpoint
ALTER TABLE `repair_jobs` ADD `net_minor` integer DEFAULT 0 NOT NULL;--> statement-breakpoint
ALTER TABLE `studios` ADD `tax_mode` text DEFAULT 'single' NOT NULL;--> statement-breakpoint
ALTER TABLE `studios` ADD `tax_inclusive` integer DEFAULT false NOT NULL;--> statement-breakpoint
ALTER TABLE `studios` ADD `tax_rates_bp` text DEFAULT '{}' NOT NULL;--> statement-breakpoint
ALTER TABLE `studios` ADD `tax_number` text DEFAULT '' NOT NULL;--> statement-breakpoint
ALTER TABLE `studios` ADD `rounding_rule` text DEFAULT 'cent' NOT NULL;--> statement-breakpoint
ALTER TABLE `studios` ADD `repair_price_list` text DEFAULT '[]' NOT NULL;