CREATE TABLE `lab_links` (
	`id` text PRIMARY KEY NOT NULL,
	`project_id` text NOT NULL,
	`submission_id` text NOT NULL,
	`token_hash` text NOT NULL,
	`sent_to` text NOT NULL,
	`expires_at` integer NOT NULL,
	`revoked_at` integer,
	`revoked_by` text,
	`last_used_at` integer,
	`created_by` text,
	`created_at` integer DEFAULT (cast(unixepoch('subsecond') * 1000 as integer)) NOT NULL,
	FOREIGN KEY (`project_id`) REFERENCES `projects`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`submission_id`) REFERENCES `submissions`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`revoked_by`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE set null,
	FOREIGN KEY (`created_by`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE UNIQUE INDEX `lab_links_token_hash_unique` ON `lab_links` (`token_hash`);--> statement-breakpoint
CREATE INDEX `lab_links_submission_idx` ON `lab_links` (`submission_id`);