CREATE TABLE `client_consents` (
	`id` text PRIMARY KEY NOT NULL,
	`studio_id` text NOT NULL,
	`client_id` text NOT NULL,
	`kind` text NOT NULL,
	`granted` integer NOT NULL,
	`given_at` integer NOT NULL,
	`source` text NOT NULL,
	`note` text DEFAULT '' NOT NULL,
	`recorded_by_id` text,
	`created_at` integer NOT NULL,
	FOREIGN KEY (`studio_id`) REFERENCES `studios`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`client_id`) REFERENCES `clients`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`recorded_by_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE INDEX `client_consents_studio_client_idx` ON `client_consents` (`studio_id`,`client_id`,`given_at`);--> statement-breakpoint
CREATE TABLE `clients` (
	`id` text PRIMARY KEY NOT NULL,
	`studio_id` text NOT NULL,
	`name` text NOT NULL,
	`email` text,
	`phone` text,
	`address` text DEFAULT '' NOT NULL,
	`preferred_contact` text DEFAULT 'email' NOT NULL,
	`time_zone` text,
	`notes` text DEFAULT '' NOT NULL,
	`consent_service` integer DEFAULT false NOT NULL,
	`consent_offers` integer DEFAULT false NOT NULL,
	`user_id` text,
	`created_at` integer NOT NULL,
	`updated_at` integer NOT NULL,
	FOREIGN KEY (`studio_id`) REFERENCES `studios`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE INDEX `clients_studio_name_idx` ON `clients` (`studio_id`,`name`);--> statement-breakpoint
CREATE INDEX `clients_studio_phone_idx` ON `clients` (`studio_id`,`phone`);--> statement-breakpoint
CREATE UNIQUE INDEX `clients_studio_email_uq` ON `clients` (`studio_id`,`email`) WHERE email IS NOT NULL;--> statement-breakpoint
CREATE UNIQUE INDEX `clients_studio_user_uq` ON `clients` (`studio_id`,`user_id`) WHERE user_id IS NOT NULL;--> statement-breakpoint
CREATE INDEX `clients_user_idx` ON `clients` (`user_id`);--> statement-breakpoint
ALTER TABLE `pieces` ADD `client_id` text REFERENCES clients(id) ON DELETE set null;--> statement-breakpoint
CREATE INDEX `pieces_client_idx` ON `pieces` (`client_id`);--> statement-breakpoint
ALTER TABLE `studios` ADD `country` text DEFAULT 'US' NOT NULL;--> statement-breakpoint
-- Back-fill: every person who has owned a piece of a studio becomes that studio's client, linked to
-- their account; consent to service mail is taken from the account's reminder setting, dated when
-- they first registered a piece there. Pieces point at their current owner's client.
INSERT INTO `clients` (`id`, `studio_id`, `name`, `email`, `user_id`, `consent_service`, `created_at`, `updated_at`)
SELECT lower(hex(randomblob(4)) || '-' || hex(randomblob(2)) || '-4' || substr(hex(randomblob(2)), 2) || '-' || substr('89ab', 1 + (abs(random()) % 4), 1) || substr(hex(randomblob(2)), 2) || '-' || hex(randomblob(6))),
  o.studio_id, u.name, u.email, u.id, u.reminders_enabled, o.first_at, o.first_at
FROM (
  SELECT studio_id, user_id, min(started_at) AS first_at FROM `ownerships` GROUP BY studio_id, user_id
  UNION ALL
  SELECT p.studio_id, p.owner_id, min(coalesce(p.registered_at, p.created_at)) FROM `pieces` p
  WHERE p.owner_id IS NOT NULL AND NOT EXISTS (SELECT 1 FROM `ownerships` x WHERE x.studio_id = p.studio_id AND x.user_id = p.owner_id)
  GROUP BY p.studio_id, p.owner_id
) o
JOIN `users` u ON u.id = o.user_id;
--> statement-breakpoint
INSERT INTO `client_consents` (`id`, `studio_id`, `client_id`, `kind`, `granted`, `given_at`, `source`, `note`, `created_at`)
SELECT lower(hex(randomblob(16))), c.studio_id, c.id, 'service', 1, c.created_at, 'account', 'Care reminders switched on in their Grainward account when they registered a piece.', c.created_at
FROM `clients` c WHERE c.consent_service = 1;
--> statement-breakpoint
UPDATE `pieces` SET `client_id` = (SELECT c.id FROM `clients` c WHERE c.studio_id = `pieces`.studio_id AND c.user_id = `pieces`.owner_id)
WHERE `owner_id` IS NOT NULL;
