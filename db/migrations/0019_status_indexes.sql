-- The status board's confirmed outcomes: per sterilizer, kind and result (a failure-confirmed cycle is a fail) the latest
-- by start, one lookup each. Partial: only confirmed cycles are indexed. The expressions are repeated word for word by
-- listConfirmedOutcomes (db/queries/sterilizer-status.ts); SQLite uses an expression index only for the same expression.
CREATE INDEX `cycles_outcome_idx` ON `cycles` (`sterilizer_id`,`test_kind`,(case when `status` = 'failure-confirmed' then 'fail' else `verdict` end),coalesce(`started_at`, `created_at`)) WHERE `status` = 'failure-confirmed' or (`status` = 'approved' and `verdict` in ('pass', 'fail'));
--> statement-breakpoint
-- Each sterilizer's cycles by start (or creation, before a file gives the start): its latest, its recent ones, its trend.
CREATE INDEX `cycles_sterilizer_at_idx` ON `cycles` (`sterilizer_id`,coalesce(`started_at`, `created_at`),`id`);
--> statement-breakpoint
-- The auditor's "recently approved": the site's approved cycles by their last change.
CREATE INDEX `cycles_site_status_updated_idx` ON `cycles` (`site_id`,`status`,`updated_at`,`id`);
