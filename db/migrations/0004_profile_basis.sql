PRAGMA foreign_keys=OFF;--> statement-breakpoint
CREATE TABLE `__new_acceptance_profiles` (
	`id` text PRIMARY KEY NOT NULL,
	`site_id` text NOT NULL,
	`name` text NOT NULL,
	`sterilization_temp_c` real NOT NULL,
	`band_k` real DEFAULT 3 NOT NULL,
	`holding_time_s` real NOT NULL,
	`max_equilibration_s` real DEFAULT 15 NOT NULL,
	`max_spread_k` real DEFAULT 2 NOT NULL,
	`saturation_limit_k` real DEFAULT 2 NOT NULL,
	`f0_reference_c` real DEFAULT 121.1 NOT NULL,
	`f0_z_k` real DEFAULT 10 NOT NULL,
	`basis` text NOT NULL,
	`basis_reason` text,
	`active` integer DEFAULT true NOT NULL,
	`created_at` text DEFAULT (strftime('%Y-%m-%dT%H:%M:%fZ', 'now')) NOT NULL,
	FOREIGN KEY (`site_id`) REFERENCES `sites`(`id`) ON UPDATE no action ON DELETE no action,
	CONSTRAINT "acceptance_profiles_basis_known" CHECK("basis" in ('en-285', 'en-13060', 'iso-17665', 'ansi-aami-st79', 'local')),
	CONSTRAINT "acceptance_profiles_local_reason" CHECK("basis" <> 'local' or length(trim(coalesce("basis_reason", ''))) > 0)
);
--> statement-breakpoint
-- A profile's basis: the demo site's profiles (site code MBG-SSD) get the standard their limits and
-- sterilizers fit (EN 13060 when only chambers under 60 l use it, else EN 285); every other existing
-- profile becomes local practice with a reason, keeping its old free text, so nothing silently
-- claims a standard.
INSERT INTO `__new_acceptance_profiles`("id", "site_id", "name", "sterilization_temp_c", "band_k", "holding_time_s", "max_equilibration_s", "max_spread_k", "saturation_limit_k", "f0_reference_c", "f0_z_k", "basis", "basis_reason", "active", "created_at")
SELECT "id", "site_id", "name", "sterilization_temp_c", "band_k", "holding_time_s", "max_equilibration_s", "max_spread_k", "saturation_limit_k", "f0_reference_c", "f0_z_k",
	"standard",
	CASE "standard" WHEN 'local' THEN 'set before bases were recorded' || CASE WHEN trim("old_basis") <> '' THEN ' (was: ' || trim("old_basis") || ')' ELSE '' END ELSE NULL END,
	"active", "created_at"
FROM (
	SELECT p.*, p."basis" AS "old_basis",
		CASE
			WHEN (SELECT "code" FROM `sites` WHERE `sites`."id" = p."site_id") <> 'MBG-SSD' THEN 'local'
			WHEN EXISTS (SELECT 1 FROM `sterilizers` s WHERE s."default_profile_id" = p."id")
				AND NOT EXISTS (SELECT 1 FROM `sterilizers` s WHERE s."default_profile_id" = p."id" AND s."chamber_volume_l" >= 60)
				AND ((p."sterilization_temp_c" = 121 AND p."holding_time_s" >= 900) OR (p."sterilization_temp_c" = 134 AND p."holding_time_s" >= 180))
				AND p."band_k" <= 4 AND p."saturation_limit_k" <= 2 THEN 'en-13060'
			WHEN ((p."sterilization_temp_c" = 121 AND p."holding_time_s" >= 900) OR (p."sterilization_temp_c" = 126 AND p."holding_time_s" >= 600) OR (p."sterilization_temp_c" = 134 AND p."holding_time_s" >= 180))
				AND p."band_k" <= 3 AND p."max_equilibration_s" <= 30 AND p."max_spread_k" <= 2 AND p."saturation_limit_k" <= 2 THEN 'en-285'
			ELSE 'local'
		END AS "standard"
	FROM `acceptance_profiles` p
);--> statement-breakpoint
DROP TABLE `acceptance_profiles`;--> statement-breakpoint
ALTER TABLE `__new_acceptance_profiles` RENAME TO `acceptance_profiles`;--> statement-breakpoint
PRAGMA foreign_keys=ON;