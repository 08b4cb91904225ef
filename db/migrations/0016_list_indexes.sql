DROP INDEX IF EXISTS `cycles_site_status_idx`;
--> statement-breakpoint
DROP INDEX IF EXISTS `cycles_sterilizer_idx`;
--> statement-breakpoint
CREATE INDEX `cycles_site_started_idx` ON `cycles` (`site_id`,`started_at`,`id`);
--> statement-breakpoint
CREATE INDEX `cycles_site_created_idx` ON `cycles` (`site_id`,`created_at`,`id`);
--> statement-breakpoint
CREATE INDEX `cycles_site_number_idx` ON `cycles` (`site_id`,`cycle_number`,`id`);
--> statement-breakpoint
CREATE INDEX `cycles_site_submitted_idx` ON `cycles` (`site_id`,`submitted_at`,`id`);
--> statement-breakpoint
CREATE INDEX `cycles_site_status_started_idx` ON `cycles` (`site_id`,`status`,`started_at`,`id`);
--> statement-breakpoint
CREATE INDEX `cycles_site_status_submitted_idx` ON `cycles` (`site_id`,`status`,`submitted_at`,`id`);
--> statement-breakpoint
CREATE INDEX `cycles_site_verdict_started_idx` ON `cycles` (`site_id`,`verdict`,`started_at`,`id`);
--> statement-breakpoint
CREATE INDEX `cycles_sterilizer_started_idx` ON `cycles` (`sterilizer_id`,`started_at`,`id`);
--> statement-breakpoint
CREATE INDEX `audit_site_seq_idx` ON `audit_events` (`site_id`,`seq`);
--> statement-breakpoint
CREATE INDEX `audit_site_action_idx` ON `audit_events` (`site_id`,`action`,`seq`);
--> statement-breakpoint
CREATE INDEX `audit_site_entity_idx` ON `audit_events` (`site_id`,`entity_type`,`entity_id`,`seq`);
--> statement-breakpoint
CREATE INDEX `reports_created_idx` ON `reports` (`created_at`);
--> statement-breakpoint
CREATE INDEX `reports_cycle_idx` ON `reports` (`cycle_id`);
