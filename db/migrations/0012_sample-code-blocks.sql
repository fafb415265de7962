CREATE TABLE `reserved_sample_codes` (
	`project_id` text NOT NULL,
	`code` text NOT NULL,
	`block_id` text NOT NULL,
	`seq` integer NOT NULL,
	`sample_id` text,
	`used_at` integer,
	PRIMARY KEY(`project_id`, `code`),
	FOREIGN KEY (`project_id`) REFERENCES `projects`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`block_id`) REFERENCES `sample_code_blocks`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE INDEX `reserved_sample_codes_block_idx` ON `reserved_sample_codes` (`block_id`);--> statement-breakpoint
CREATE TABLE `sample_code_blocks` (
	`id` text PRIMARY KEY NOT NULL,
	`project_id` text NOT NULL,
	`device_id` text NOT NULL,
	`device_label` text,
	`user_id` text NOT NULL,
	`first_seq` integer NOT NULL,
	`last_seq` integer NOT NULL,
	`first_code` text NOT NULL,
	`last_code` text NOT NULL,
	`size` integer NOT NULL,
	`created_at` integer DEFAULT (cast(unixepoch('subsecond') * 1000 as integer)) NOT NULL,
	FOREIGN KEY (`project_id`) REFERENCES `projects`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`user_id`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE INDEX `sample_code_blocks_device_idx` ON `sample_code_blocks` (`project_id`,`device_id`,`user_id`);--> statement-breakpoint
ALTER TABLE `structures` ADD `version` integer DEFAULT 1 NOT NULL;