CREATE TABLE `loading_patterns` (
	`id` text PRIMARY KEY NOT NULL,
	`site_id` text NOT NULL,
	`sterilizer_id` text NOT NULL,
	`name` text NOT NULL,
	`description` text DEFAULT '' NOT NULL,
	`load_type` text,
	`items` text NOT NULL,
	`positions` text NOT NULL,
	`photo_attachment_id` text,
	`requalification_due_on` text,
	`required_before_use` integer DEFAULT false NOT NULL,
	`created_by` text NOT NULL,
	`created_at` text DEFAULT (strftime('%Y-%m-%dT%H:%M:%fZ', 'now')) NOT NULL,
	`updated_at` text,
	FOREIGN KEY (`site_id`) REFERENCES `sites`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`sterilizer_id`) REFERENCES `sterilizers`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`photo_attachment_id`) REFERENCES `attachments`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`created_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `loading_patterns_sterilizer_idx` ON `loading_patterns` (`sterilizer_id`,`name`);--> statement-breakpoint
CREATE INDEX `loading_patterns_site_due_idx` ON `loading_patterns` (`site_id`,`requalification_due_on`);--> statement-breakpoint
CREATE TABLE `studies` (
	`id` text PRIMARY KEY NOT NULL,
	`site_id` text NOT NULL,
	`study_number` text NOT NULL,
	`title` text NOT NULL,
	`sterilizer_id` text NOT NULL,
	`profile_id` text NOT NULL,
	`loading_pattern_id` text NOT NULL,
	`kind` text NOT NULL,
	`runs_required` integer DEFAULT 3 NOT NULL,
	`min_f0_min` real,
	`max_spread_k` real,
	`indicators_required` integer DEFAULT true NOT NULL,
	`protocol` text DEFAULT '' NOT NULL,
	`requalification_months` integer DEFAULT 12 NOT NULL,
	`status` text DEFAULT 'draft' NOT NULL,
	`created_by` text NOT NULL,
	`created_at` text DEFAULT (strftime('%Y-%m-%dT%H:%M:%fZ', 'now')) NOT NULL,
	`updated_at` text,
	FOREIGN KEY (`site_id`) REFERENCES `sites`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`sterilizer_id`) REFERENCES `sterilizers`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`profile_id`) REFERENCES `acceptance_profiles`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`loading_pattern_id`) REFERENCES `loading_patterns`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`created_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `studies_site_number_idx` ON `studies` (`site_id`,`study_number`);--> statement-breakpoint
CREATE INDEX `studies_site_status_idx` ON `studies` (`site_id`,`status`,`created_at`);--> statement-breakpoint
CREATE INDEX `studies_pattern_idx` ON `studies` (`loading_pattern_id`);--> statement-breakpoint
CREATE TABLE `study_deviations` (
	`id` text PRIMARY KEY NOT NULL,
	`study_id` text NOT NULL,
	`study_run_id` text,
	`source` text NOT NULL,
	`what` text NOT NULL,
	`impact` text DEFAULT '' NOT NULL,
	`root_cause` text DEFAULT '' NOT NULL,
	`capa_reference` text DEFAULT '' NOT NULL,
	`status` text DEFAULT 'open' NOT NULL,
	`opened_by` text,
	`opened_at` text DEFAULT (strftime('%Y-%m-%dT%H:%M:%fZ', 'now')) NOT NULL,
	`closed_by` text,
	`closed_at` text,
	`close_reason` text,
	`updated_at` text,
	FOREIGN KEY (`study_id`) REFERENCES `studies`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`study_run_id`) REFERENCES `study_runs`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`opened_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`closed_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `study_deviations_study_idx` ON `study_deviations` (`study_id`,`status`);--> statement-breakpoint
CREATE TABLE `study_indicators` (
	`id` text PRIMARY KEY NOT NULL,
	`study_run_id` text NOT NULL,
	`position_id` text NOT NULL,
	`kind` text NOT NULL,
	`result` text NOT NULL,
	`organism` text,
	`lot` text NOT NULL,
	`population` real,
	`incubation` text,
	`read_by` text NOT NULL,
	`read_at` text NOT NULL,
	`reason` text,
	`recorded_by` text NOT NULL,
	`recorded_at` text DEFAULT (strftime('%Y-%m-%dT%H:%M:%fZ', 'now')) NOT NULL,
	FOREIGN KEY (`study_run_id`) REFERENCES `study_runs`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`recorded_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `study_indicators_run_idx` ON `study_indicators` (`study_run_id`,`position_id`,`kind`,`recorded_at`);--> statement-breakpoint
CREATE TABLE `study_reports` (
	`id` text PRIMARY KEY NOT NULL,
	`study_id` text NOT NULL,
	`signature_id` text NOT NULL,
	`report_number` text NOT NULL,
	`sha256` text NOT NULL,
	`size_bytes` integer NOT NULL,
	`bytes` blob NOT NULL,
	`created_at` text DEFAULT (strftime('%Y-%m-%dT%H:%M:%fZ', 'now')) NOT NULL,
	FOREIGN KEY (`study_id`) REFERENCES `studies`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`signature_id`) REFERENCES `study_signatures`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `study_reports_report_number_unique` ON `study_reports` (`report_number`);--> statement-breakpoint
CREATE INDEX `study_reports_study_idx` ON `study_reports` (`study_id`);--> statement-breakpoint
CREATE INDEX `study_reports_sha_idx` ON `study_reports` (`sha256`);--> statement-breakpoint
CREATE TABLE `study_runs` (
	`id` text PRIMARY KEY NOT NULL,
	`study_id` text NOT NULL,
	`cycle_id` text NOT NULL,
	`analysis_id` text NOT NULL,
	`run_number` integer NOT NULL,
	`sensor_map` text NOT NULL,
	`attached_by` text NOT NULL,
	`attached_at` text DEFAULT (strftime('%Y-%m-%dT%H:%M:%fZ', 'now')) NOT NULL,
	FOREIGN KEY (`study_id`) REFERENCES `studies`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`cycle_id`) REFERENCES `cycles`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`analysis_id`) REFERENCES `analyses`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`attached_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `study_runs_study_cycle_idx` ON `study_runs` (`study_id`,`cycle_id`);--> statement-breakpoint
CREATE UNIQUE INDEX `study_runs_study_number_idx` ON `study_runs` (`study_id`,`run_number`);--> statement-breakpoint
CREATE TABLE `study_signatures` (
	`id` text PRIMARY KEY NOT NULL,
	`study_id` text NOT NULL,
	`user_id` text NOT NULL,
	`printed_name` text NOT NULL,
	`role` text NOT NULL,
	`meaning` text NOT NULL,
	`reason` text,
	`signed_at` text NOT NULL,
	`content_hash` text NOT NULL,
	FOREIGN KEY (`study_id`) REFERENCES `studies`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `study_signatures_study_idx` ON `study_signatures` (`study_id`,`signed_at`);--> statement-breakpoint
-- Indicator readings, study signatures and archived study reports are evidence: never rewritten in place.
CREATE TRIGGER study_indicators_no_update BEFORE UPDATE ON study_indicators
BEGIN
  SELECT RAISE(ABORT, 'indicator readings cannot be changed');
END;
--> statement-breakpoint
CREATE TRIGGER study_indicators_no_delete BEFORE DELETE ON study_indicators
BEGIN
  SELECT RAISE(ABORT, 'indicator readings cannot be deleted');
END;
--> statement-breakpoint
CREATE TRIGGER study_signatures_no_update BEFORE UPDATE ON study_signatures
BEGIN
  SELECT RAISE(ABORT, 'study signatures cannot be changed');
END;
--> statement-breakpoint
CREATE TRIGGER study_signatures_no_delete BEFORE DELETE ON study_signatures
BEGIN
  SELECT RAISE(ABORT, 'study signatures cannot be deleted');
END;
--> statement-breakpoint
CREATE TRIGGER study_reports_no_update BEFORE UPDATE ON study_reports
BEGIN
  SELECT RAISE(ABORT, 'archived study reports cannot be changed');
END;
--> statement-breakpoint
CREATE TRIGGER study_reports_no_delete BEFORE DELETE ON study_reports
BEGIN
  SELECT RAISE(ABORT, 'archived study reports cannot be deleted');
END;
--> statement-breakpoint
CREATE TRIGGER study_runs_no_delete BEFORE DELETE ON study_runs
BEGIN
  SELECT RAISE(ABORT, 'study runs cannot be removed; a run attached in error is recorded with a deviation');
END;
