ALTER TABLE `phase_results` ADD `wt_sigma` real;--> statement-breakpoint
ALTER TABLE `phase_results` ADD `fitted` integer DEFAULT false NOT NULL;--> statement-breakpoint
ALTER TABLE `phase_results` ADD `fit_json` text;--> statement-breakpoint
ALTER TABLE `scans` ADD `sign_off_json` text;