ALTER TABLE `projects` ADD `lab_in_house` integer DEFAULT false NOT NULL;--> statement-breakpoint
ALTER TABLE `custody_events` ADD `status_after` text;--> statement-breakpoint
ALTER TABLE `custody_events` ADD `scan_id` text;--> statement-breakpoint
ALTER TABLE `submissions` ADD `sent_by` text REFERENCES user(id);--> statement-breakpoint
ALTER TABLE `submissions` ADD `last_mailed_at` integer;--> statement-breakpoint
ALTER TABLE `submissions` ADD `mail_count` integer DEFAULT 0 NOT NULL;