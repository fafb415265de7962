ALTER TABLE `photos` ADD `taken_local` text;--> statement-breakpoint
ALTER TABLE `photos` ADD `taken_offset` text;--> statement-breakpoint
ALTER TABLE `photos` ADD `gps_h_error_m` real;--> statement-breakpoint
ALTER TABLE `photos` ADD `img_direction_ref` text;--> statement-breakpoint
ALTER TABLE `samples` ADD `elevation_ref` text;--> statement-breakpoint
ALTER TABLE `samples` ADD `location_fixed_at` text;--> statement-breakpoint
ALTER TABLE `samples` ADD `type_details` text;--> statement-breakpoint
ALTER TABLE `stations` ADD `location_fixed_at` text;--> statement-breakpoint
ALTER TABLE `structures` ADD `rake` real;--> statement-breakpoint
ALTER TABLE `structures` ADD `plane_id` text;--> statement-breakpoint
ALTER TABLE `structures` ADD `generation` text;--> statement-breakpoint
ALTER TABLE `structures` ADD `overturned` integer DEFAULT false NOT NULL;--> statement-breakpoint
ALTER TABLE `structures` ADD `quality` text;--> statement-breakpoint
ALTER TABLE `structures` ADD `raw_azimuth` real;--> statement-breakpoint
ALTER TABLE `structures` ADD `declination_deg` real;--> statement-breakpoint
ALTER TABLE `structures` ADD `declination_applied` integer DEFAULT false NOT NULL;