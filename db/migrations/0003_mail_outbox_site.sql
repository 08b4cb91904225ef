ALTER TABLE `mail_outbox` ADD `site_id` text REFERENCES sites(id);--> statement-breakpoint
CREATE INDEX `mail_outbox_site_idx` ON `mail_outbox` (`site_id`,`created_at`);--> statement-breakpoint
UPDATE `mail_outbox` SET `site_id` = (SELECT `site_id` FROM `cycles` WHERE `cycles`.`id` = `mail_outbox`.`related_cycle_id`) WHERE `site_id` IS NULL;
