-- Free-text search of cycles through FTS5 with the trigram tokenizer: a search text of three or more characters
-- is found as a substring (case- and accent-insensitive) from the index instead of LIKE over every row.
-- The FTS rows are keyed by cycle_search_rows.row, an INTEGER PRIMARY KEY that VACUUM (and VACUUM INTO, the
-- backup) never renumbers; the cycles table's own rowid is implicit and may change.
CREATE TABLE `cycle_search_rows` (
	`row` integer PRIMARY KEY,
	`cycle_id` text NOT NULL UNIQUE
);
--> statement-breakpoint
CREATE VIRTUAL TABLE `cycles_search` USING fts5(`cycle_number`, `load_description`, `sterilizer_name`, tokenize = 'trigram remove_diacritics 1');
--> statement-breakpoint
INSERT INTO `cycle_search_rows` (`cycle_id`) SELECT `id` FROM `cycles`;
--> statement-breakpoint
INSERT INTO `cycles_search` (`rowid`, `cycle_number`, `load_description`, `sterilizer_name`)
	SELECT k.`row`, c.`cycle_number`, c.`load_description`, s.`name`
	FROM `cycle_search_rows` k JOIN `cycles` c ON c.`id` = k.`cycle_id` JOIN `sterilizers` s ON s.`id` = c.`sterilizer_id`;
--> statement-breakpoint
CREATE TRIGGER `cycles_search_insert` AFTER INSERT ON `cycles` BEGIN
	INSERT INTO `cycle_search_rows` (`cycle_id`) VALUES (new.`id`);
	INSERT INTO `cycles_search` (`rowid`, `cycle_number`, `load_description`, `sterilizer_name`)
		VALUES (last_insert_rowid(), new.`cycle_number`, new.`load_description`, (SELECT `name` FROM `sterilizers` WHERE `id` = new.`sterilizer_id`));
END;
--> statement-breakpoint
CREATE TRIGGER `cycles_search_update` AFTER UPDATE OF `cycle_number`, `load_description`, `sterilizer_id` ON `cycles`
WHEN old.`cycle_number` IS NOT new.`cycle_number` OR old.`load_description` IS NOT new.`load_description` OR old.`sterilizer_id` IS NOT new.`sterilizer_id` BEGIN
	UPDATE `cycles_search`
		SET `cycle_number` = new.`cycle_number`, `load_description` = new.`load_description`, `sterilizer_name` = (SELECT `name` FROM `sterilizers` WHERE `id` = new.`sterilizer_id`)
		WHERE `rowid` = (SELECT `row` FROM `cycle_search_rows` WHERE `cycle_id` = new.`id`);
END;
--> statement-breakpoint
CREATE TRIGGER `cycles_search_delete` AFTER DELETE ON `cycles` BEGIN
	DELETE FROM `cycles_search` WHERE `rowid` = (SELECT `row` FROM `cycle_search_rows` WHERE `cycle_id` = old.`id`);
	DELETE FROM `cycle_search_rows` WHERE `cycle_id` = old.`id`;
END;
--> statement-breakpoint
CREATE TRIGGER `cycles_search_sterilizer_rename` AFTER UPDATE OF `name` ON `sterilizers` WHEN old.`name` IS NOT new.`name` BEGIN
	UPDATE `cycles_search` SET `sterilizer_name` = new.`name`
		WHERE `rowid` IN (SELECT k.`row` FROM `cycles` c JOIN `cycle_search_rows` k ON k.`cycle_id` = c.`id` WHERE c.`sterilizer_id` = new.`id`);
END;
--> statement-breakpoint
-- The cycles list sorted by sterilizer walks the site's sterilizers by name, then each one's cycles by start time.
-- UNIQUE (the id makes it so anyway) tells SQLite each index entry is one sterilizer, so the cycles need no sort within it.
CREATE UNIQUE INDEX `sterilizers_site_name_idx` ON `sterilizers` (`site_id`,`name`,`id`);
