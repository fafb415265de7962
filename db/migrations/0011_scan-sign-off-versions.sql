CREATE TABLE `scan_sign_offs` (
	`id` text PRIMARY KEY NOT NULL,
	`scan_id` text NOT NULL,
	`project_id` text NOT NULL,
	`version` integer NOT NULL,
	`run_id` text NOT NULL,
	`record_json` text NOT NULL,
	`note` text,
	`signed_by` text,
	`signed_at` integer NOT NULL,
	`reopened_at` integer,
	`reopened_by` text,
	`reopen_reason` text,
	FOREIGN KEY (`scan_id`) REFERENCES `scans`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`project_id`) REFERENCES `projects`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`signed_by`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE set null,
	FOREIGN KEY (`reopened_by`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE UNIQUE INDEX `scan_sign_offs_version_uq` ON `scan_sign_offs` (`scan_id`,`version`);--> statement-breakpoint
-- Scans signed off before versions existed get their sign-off as version 1.
INSERT INTO `scan_sign_offs` (`id`, `scan_id`, `project_id`, `version`, `run_id`, `record_json`, `note`, `signed_by`, `signed_at`)
SELECT lower(hex(randomblob(16))), `id`, `project_id`, 1, coalesce(`current_run_id`, ''), coalesce(`sign_off_json`, '{}'), `analyst_note`, `signed_off_by`, coalesce(`signed_off_at`, `created_at`)
FROM `scans` WHERE `status` = 'signed_off';
