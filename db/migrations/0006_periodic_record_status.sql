ALTER TABLE `periodic_tests` ADD `status` text DEFAULT 'approved' NOT NULL;
