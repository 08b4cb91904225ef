ALTER TABLE `acceptance_profiles` ADD `max_sample_interval_s` real;--> statement-breakpoint
ALTER TABLE `acceptance_profiles` ADD `free_space_early_k` real DEFAULT 5 NOT NULL;--> statement-breakpoint
ALTER TABLE `acceptance_profiles` ADD `free_space_early_s` real DEFAULT 60 NOT NULL;--> statement-breakpoint
ALTER TABLE `acceptance_profiles` ADD `free_space_k` real DEFAULT 2 NOT NULL;