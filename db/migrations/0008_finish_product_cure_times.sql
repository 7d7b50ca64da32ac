ALTER TABLE `finish_products` ADD `cure_light_use_hours` integer;--> statement-breakpoint
ALTER TABLE `finish_products` ADD `cure_full_days` integer;