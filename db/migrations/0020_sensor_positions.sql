ALTER TABLE `cycles` ADD `load_type` text;
--> statement-breakpoint
ALTER TABLE `cycles` ADD `load_lot` text DEFAULT '' NOT NULL;
--> statement-breakpoint
ALTER TABLE `analyses` ADD `mapping` text;
