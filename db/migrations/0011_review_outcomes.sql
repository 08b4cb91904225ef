-- Review outcomes with their GMP meaning: "rejected" cycles were returned for correction. Their signatures keep
-- the word "rejected" (the signatures table is append-only); it stays readable as the legacy meaning.
UPDATE `cycles` SET `status` = 'returned' WHERE `status` = 'rejected';
--> statement-breakpoint
ALTER TABLE `analyses` ADD `reason` text;
--> statement-breakpoint
ALTER TABLE `logger_files` ADD `duplicate_reason` text;
