CREATE TABLE `handover_batch_items` (
	`id` text PRIMARY KEY NOT NULL,
	`batch_id` text NOT NULL,
	`studio_id` text NOT NULL,
	`piece_id` text NOT NULL,
	`outcome` text DEFAULT 'pending' NOT NULL,
	`reason` text,
	`updated_at` integer NOT NULL,
	FOREIGN KEY (`batch_id`) REFERENCES `handover_batches`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`studio_id`) REFERENCES `studios`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`piece_id`) REFERENCES `pieces`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE UNIQUE INDEX `handover_batch_items_piece_uq` ON `handover_batch_items` (`batch_id`,`piece_id`);--> statement-breakpoint
CREATE INDEX `handover_batch_items_outcome_idx` ON `handover_batch_items` (`batch_id`,`outcome`);--> statement-breakpoint
CREATE TABLE `handover_batches` (
	`id` text PRIMARY KEY NOT NULL,
	`studio_id` text NOT NULL,
	`created_by_id` text,
	`source` text NOT NULL,
	`state` text DEFAULT 'queued' NOT NULL,
	`created_at` integer NOT NULL,
	`started_at` integer,
	`finished_at` integer,
	`updated_at` integer NOT NULL,
	FOREIGN KEY (`studio_id`) REFERENCES `studios`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`created_by_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE INDEX `handover_batches_studio_idx` ON `handover_batches` (`studio_id`,`created_at`);