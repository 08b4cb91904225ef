CREATE TABLE `attachments` (
	`id` text PRIMARY KEY NOT NULL,
	`site_id` text NOT NULL,
	`owner_kind` text NOT NULL,
	`owner_id` text NOT NULL,
	`name` text NOT NULL,
	`content_type` text NOT NULL,
	`size_bytes` integer NOT NULL,
	`sha256` text NOT NULL,
	`bytes` blob NOT NULL,
	`uploaded_by` text NOT NULL,
	`uploaded_at` text DEFAULT (strftime('%Y-%m-%dT%H:%M:%fZ', 'now')) NOT NULL,
	FOREIGN KEY (`site_id`) REFERENCES `sites`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`uploaded_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `attachments_owner_idx` ON `attachments` (`owner_kind`,`owner_id`);
--> statement-breakpoint
CREATE TABLE `indicator_sheets` (
	`id` text PRIMARY KEY NOT NULL,
	`cycle_id` text NOT NULL,
	`result` text NOT NULL,
	`indicator_lot` text,
	`attachment_id` text NOT NULL,
	`reason` text,
	`recorded_by` text NOT NULL,
	`recorded_at` text DEFAULT (strftime('%Y-%m-%dT%H:%M:%fZ', 'now')) NOT NULL,
	FOREIGN KEY (`cycle_id`) REFERENCES `cycles`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`attachment_id`) REFERENCES `attachments`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`recorded_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `indicator_sheets_cycle_idx` ON `indicator_sheets` (`cycle_id`,`recorded_at`);
--> statement-breakpoint
CREATE TABLE `periodic_test_signatures` (
	`id` text PRIMARY KEY NOT NULL,
	`periodic_test_id` text NOT NULL,
	`user_id` text NOT NULL,
	`printed_name` text NOT NULL,
	`role` text NOT NULL,
	`meaning` text NOT NULL,
	`reason` text,
	`signed_at` text NOT NULL,
	`record_hash` text NOT NULL,
	FOREIGN KEY (`periodic_test_id`) REFERENCES `periodic_tests`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `periodic_test_signatures_test_idx` ON `periodic_test_signatures` (`periodic_test_id`);
--> statement-breakpoint
-- Photos, sheet readings and periodic-test signatures are evidence: never rewritten in place.
CREATE TRIGGER attachments_no_update BEFORE UPDATE ON attachments
BEGIN
  SELECT RAISE(ABORT, 'attachments cannot be changed');
END;
--> statement-breakpoint
CREATE TRIGGER attachments_no_delete BEFORE DELETE ON attachments
BEGIN
  SELECT RAISE(ABORT, 'attachments cannot be deleted');
END;
--> statement-breakpoint
CREATE TRIGGER indicator_sheets_no_update BEFORE UPDATE ON indicator_sheets
BEGIN
  SELECT RAISE(ABORT, 'indicator sheet readings cannot be changed');
END;
--> statement-breakpoint
CREATE TRIGGER indicator_sheets_no_delete BEFORE DELETE ON indicator_sheets
BEGIN
  SELECT RAISE(ABORT, 'indicator sheet readings cannot be deleted');
END;
--> statement-breakpoint
CREATE TRIGGER periodic_test_signatures_no_update BEFORE UPDATE ON periodic_test_signatures
BEGIN
  SELECT RAISE(ABORT, 'signatures cannot be changed');
END;
--> statement-breakpoint
CREATE TRIGGER periodic_test_signatures_no_delete BEFORE DELETE ON periodic_test_signatures
BEGIN
  SELECT RAISE(ABORT, 'signatures cannot be deleted');
END;
