ALTER TABLE `test_schedules` ADD `required_before_use` integer DEFAULT false NOT NULL;
--> statement-breakpoint
-- The steam penetration and air leakage tests already scheduled are the ones a vacuum sterilizer needs before use (HTM 01-01 Part C, common practice).
UPDATE `test_schedules` SET `required_before_use` = 1 WHERE `kind` IN ('bowie-dick', 'air-leakage');
--> statement-breakpoint
ALTER TABLE `sterilizers` ADD `status` text DEFAULT 'in-use' NOT NULL;
--> statement-breakpoint
ALTER TABLE `sterilizers` ADD `status_reason` text;
--> statement-breakpoint
ALTER TABLE `sterilizers` ADD `status_since` text;
--> statement-breakpoint
CREATE TABLE `sterilizer_status_events` (
	`id` text PRIMARY KEY NOT NULL,
	`sterilizer_id` text NOT NULL,
	`status` text NOT NULL,
	`reason` text NOT NULL,
	`at` text NOT NULL,
	`since` text NOT NULL,
	`kind` text NOT NULL,
	`cause` text NOT NULL,
	`user_id` text,
	`printed_name` text,
	`role` text,
	`password_reauthenticated` integer DEFAULT false NOT NULL,
	`acknowledged` text,
	FOREIGN KEY (`sterilizer_id`) REFERENCES `sterilizers`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `sterilizer_status_events_idx` ON `sterilizer_status_events` (`sterilizer_id`,`at`);
--> statement-breakpoint
-- A signed release or hold is evidence, like a signature: never rewritten in place.
CREATE TRIGGER sterilizer_status_events_no_update BEFORE UPDATE ON sterilizer_status_events
BEGIN
  SELECT RAISE(ABORT, 'sterilizer status events are append-only');
END;
--> statement-breakpoint
CREATE TRIGGER sterilizer_status_events_no_delete BEFORE DELETE ON sterilizer_status_events
BEGIN
  SELECT RAISE(ABORT, 'sterilizer status events are append-only');
END;
