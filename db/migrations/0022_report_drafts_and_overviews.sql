CREATE TABLE `report_drafts` (
	`cycle_id` text PRIMARY KEY NOT NULL,
	`input_sha256` text NOT NULL,
	`sha256` text NOT NULL,
	`bytes` blob NOT NULL,
	`rendered_at` text NOT NULL,
	FOREIGN KEY (`cycle_id`) REFERENCES `cycles`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
ALTER TABLE `analysis_series` ADD `overview` text;