-- Repair jobs made for a care plan's included visits (lib/plans/visits.ts) were stored with origin
-- 'studio'; their only link to the plan was the plan_visits row pointing at them. Such jobs now carry
-- origin 'plan' (JOB_ORIGINS, lib/care/vocabulary.ts), so what they show says the plan pays their covered
-- part, not the warranty. Every job a plan visit points at is brought forward.
UPDATE `repair_jobs` SET `origin` = 'plan' WHERE `origin` = 'studio' AND `id` IN (SELECT `job_id` FROM `plan_visits` WHERE `job_id` IS NOT NULL);
