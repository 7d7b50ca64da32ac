-- Claim messages move into the claim's thread (lib/messages): one thread per claim that has messages,
-- unread when the owner wrote last (waiting since that message), open otherwise.
INSERT INTO `threads` (`id`, `studio_id`, `subject`, `claim_id`, `piece_id`, `owner_id`, `state`, `waiting_since`, `last_message_at`, `created_at`, `updated_at`)
SELECT
	lower(hex(randomblob(4))) || '-' || lower(hex(randomblob(2))) || '-4' || substr(lower(hex(randomblob(2))), 2) || '-' || substr('89ab', 1 + (abs(random()) % 4), 1) || substr(lower(hex(randomblob(2))), 2) || '-' || lower(hex(randomblob(6))),
	c.`studio_id`, 'claim', c.`id`, c.`piece_id`, c.`owner_id`,
	CASE WHEN last.`from_studio` = 0 THEN 'unread' ELSE 'open' END,
	CASE WHEN last.`from_studio` = 0 THEN last.`created_at` ELSE NULL END,
	last.`created_at`, first.`created_at`, last.`created_at`
FROM `claims` c
JOIN `claim_messages` last ON last.`id` = (SELECT m.`id` FROM `claim_messages` m WHERE m.`claim_id` = c.`id` ORDER BY m.`created_at` DESC, m.`id` DESC LIMIT 1)
JOIN `claim_messages` first ON first.`id` = (SELECT m.`id` FROM `claim_messages` m WHERE m.`claim_id` = c.`id` ORDER BY m.`created_at` ASC, m.`id` ASC LIMIT 1)
WHERE NOT EXISTS (SELECT 1 FROM `threads` t WHERE t.`claim_id` = c.`id`);
--> statement-breakpoint
INSERT INTO `thread_messages` (`id`, `studio_id`, `thread_id`, `author`, `author_id`, `source`, `body`, `created_at`)
SELECT m.`id`, m.`studio_id`, t.`id`, CASE WHEN m.`from_studio` = 1 THEN 'staff' ELSE 'owner' END, m.`author_id`, 'web', m.`body`, m.`created_at`
FROM `claim_messages` m JOIN `threads` t ON t.`claim_id` = m.`claim_id`;
--> statement-breakpoint
DROP TABLE `claim_messages`;
