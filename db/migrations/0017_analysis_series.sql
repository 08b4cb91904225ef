CREATE TABLE `analysis_series` (
	`analysis_id` text PRIMARY KEY NOT NULL,
	`meta` text NOT NULL,
	`sample_count` integer NOT NULL,
	`times_s` blob NOT NULL,
	`channel_values` blob NOT NULL,
	`created_at` text DEFAULT (strftime('%Y-%m-%dT%H:%M:%fZ', 'now')) NOT NULL,
	FOREIGN KEY (`analysis_id`) REFERENCES `analyses`(`id`) ON UPDATE no action ON DELETE no action
);
