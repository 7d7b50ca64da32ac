-- Three guards on where care-plan money moves (lib/plans):
-- 1. plan_refunds: a refund the payment service refused is kept as 'refused' with staff's words for why
--    (refused_words, refused_at) and is not asked again (lib/plans/refund.ts).
-- 2. plan_subscriptions.payer_id: who pays the plan, kept when it passes on with its piece (owner_id
--    null), so mail about their money finds them from our records. Brought forward from the owner, or
--    for a plan already passed on, from the person whose release moved it (audit plan.changed_hands).
-- 3. plan_subscriptions.checkout_claimed_at: set while a plan's payment page may be open; the partial
--    unique index lets one plan of a piece hold it, across processes (lib/plans/subscriptions.ts).
ALTER TABLE `plan_refunds` ADD `refused_words` text;--> statement-breakpoint
ALTER TABLE `plan_refunds` ADD `refused_at` integer;--> statement-breakpoint
ALTER TABLE `plan_subscriptions` ADD `payer_id` text REFERENCES users(id) ON DELETE set null;--> statement-breakpoint
UPDATE `plan_subscriptions` SET `payer_id` = COALESCE(`owner_id`, (SELECT `a`.`actor_id` FROM `audit_log` `a` WHERE `a`.`subject_type` = 'plan_subscription' AND `a`.`subject_id` = `plan_subscriptions`.`id` AND `a`.`action` = 'plan.changed_hands' ORDER BY `a`.`created_at` LIMIT 1));--> statement-breakpoint
ALTER TABLE `plan_subscriptions` ADD `checkout_claimed_at` integer;--> statement-breakpoint
CREATE UNIQUE INDEX `plan_subscriptions_one_open_checkout_uq` ON `plan_subscriptions` (`piece_id`) WHERE checkout_claimed_at IS NOT NULL;
