CREATE TABLE `piece_handovers` (
	`id` text PRIMARY KEY NOT NULL,
	`studio_id` text NOT NULL,
	`piece_id` text NOT NULL,
	`client_id` text,
	`email` text,
	`token_hash` text,
	`expires_at` integer,
	`first_sent_at` integer,
	`last_sent_at` integer,
	`send_count` integer DEFAULT 0 NOT NULL,
	`opened_at` integer,
	`registered_at` integer,
	`used_at` integer,
	`created_at` integer NOT NULL,
	`updated_at` integer NOT NULL,
	FOREIGN KEY (`studio_id`) REFERENCES `studios`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`piece_id`) REFERENCES `pieces`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`client_id`) REFERENCES `clients`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE UNIQUE INDEX `piece_handovers_token_hash_unique` ON `piece_handovers` (`token_hash`);--> statement-breakpoint
CREATE UNIQUE INDEX `piece_handovers_piece_uq` ON `piece_handovers` (`piece_id`);--> statement-breakpoint
CREATE INDEX `piece_handovers_studio_client_idx` ON `piece_handovers` (`studio_id`,`client_id`);