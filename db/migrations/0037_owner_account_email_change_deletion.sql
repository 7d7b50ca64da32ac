ALTER TABLE `user_tokens` ADD `new_email` text;--> statement-breakpoint
ALTER TABLE `users` ADD `deleted_at` integer;