ALTER TABLE `custody_events` ADD `waybill` text;--> statement-breakpoint
ALTER TABLE `custody_events` ADD `handed_to` text;--> statement-breakpoint
ALTER TABLE `submissions` ADD `qaqc_note` text;--> statement-breakpoint
ALTER TABLE `submissions` ADD `lab_reference` text;--> statement-breakpoint
ALTER TABLE `submissions` ADD `received_at` integer;--> statement-breakpoint
ALTER TABLE `submissions` ADD `reported_at` integer;