-- The scheduler pass (jobs/job-refunds.ts, lib/repairs/refunds.ts) looks for refunds still pending after five
-- minutes: refunded_at IS NULL and created_at before the cutoff. Without this it read every refund ever made.
CREATE INDEX `job_refunds_pending_idx` ON `job_refunds` (`created_at`) WHERE refunded_at IS NULL;