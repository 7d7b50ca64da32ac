-- A job's page finds the care plan visit it is by job (lib/repairs/jobs.ts visitPlanName: studio_id and
-- job_id); plan_visits had only its studio index, so each lookup read every visit of the studio. Deleting a
-- repair job (ON DELETE SET NULL on job_id) searches the same column.
CREATE INDEX `plan_visits_job_idx` ON `plan_visits` (`job_id`);
