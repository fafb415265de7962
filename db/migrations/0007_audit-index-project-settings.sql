ALTER TABLE `projects` ADD `lab_address` text;--> statement-breakpoint
ALTER TABLE `projects` ADD `time_zone` text;--> statement-breakpoint
ALTER TABLE `projects` ADD `default_anode` text;--> statement-breakpoint
ALTER TABLE `projects` ADD `default_instrument` text;--> statement-breakpoint
ALTER TABLE `projects` ADD `sample_code_pattern` text;--> statement-breakpoint
ALTER TABLE `projects` ADD `archived_at` integer;--> statement-breakpoint
ALTER TABLE `projects` ADD `created_by` text REFERENCES user(id);--> statement-breakpoint
ALTER TABLE `projects` ADD `version` integer DEFAULT 1 NOT NULL;--> statement-breakpoint
CREATE INDEX `audit_project_actor_idx` ON `audit_log` (`project_id`,`actor_id`);