CREATE TABLE `account` (
	`id` text PRIMARY KEY NOT NULL,
	`account_id` text NOT NULL,
	`provider_id` text NOT NULL,
	`user_id` text NOT NULL,
	`access_token` text,
	`refresh_token` text,
	`id_token` text,
	`access_token_expires_at` integer,
	`refresh_token_expires_at` integer,
	`scope` text,
	`password` text,
	`created_at` integer DEFAULT (cast(unixepoch('subsecond') * 1000 as integer)) NOT NULL,
	`updated_at` integer NOT NULL,
	FOREIGN KEY (`user_id`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE INDEX `account_userId_idx` ON `account` (`user_id`);--> statement-breakpoint
CREATE TABLE `session` (
	`id` text PRIMARY KEY NOT NULL,
	`expires_at` integer NOT NULL,
	`token` text NOT NULL,
	`created_at` integer DEFAULT (cast(unixepoch('subsecond') * 1000 as integer)) NOT NULL,
	`updated_at` integer NOT NULL,
	`ip_address` text,
	`user_agent` text,
	`user_id` text NOT NULL,
	`impersonated_by` text,
	FOREIGN KEY (`user_id`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE UNIQUE INDEX `session_token_unique` ON `session` (`token`);--> statement-breakpoint
CREATE INDEX `session_userId_idx` ON `session` (`user_id`);--> statement-breakpoint
CREATE TABLE `user` (
	`id` text PRIMARY KEY NOT NULL,
	`name` text NOT NULL,
	`email` text NOT NULL,
	`email_verified` integer DEFAULT false NOT NULL,
	`image` text,
	`created_at` integer DEFAULT (cast(unixepoch('subsecond') * 1000 as integer)) NOT NULL,
	`updated_at` integer DEFAULT (cast(unixepoch('subsecond') * 1000 as integer)) NOT NULL,
	`role` text,
	`banned` integer DEFAULT false,
	`ban_reason` text,
	`ban_expires` integer
);
--> statement-breakpoint
CREATE UNIQUE INDEX `user_email_unique` ON `user` (`email`);--> statement-breakpoint
CREATE TABLE `verification` (
	`id` text PRIMARY KEY NOT NULL,
	`identifier` text NOT NULL,
	`value` text NOT NULL,
	`expires_at` integer NOT NULL,
	`created_at` integer DEFAULT (cast(unixepoch('subsecond') * 1000 as integer)) NOT NULL,
	`updated_at` integer DEFAULT (cast(unixepoch('subsecond') * 1000 as integer)) NOT NULL
);
--> statement-breakpoint
CREATE INDEX `verification_identifier_idx` ON `verification` (`identifier`);--> statement-breakpoint
CREATE TABLE `invitations` (
	`id` text PRIMARY KEY NOT NULL,
	`project_id` text NOT NULL,
	`email` text NOT NULL,
	`role` text NOT NULL,
	`token_hash` text NOT NULL,
	`invited_by` text,
	`expires_at` integer NOT NULL,
	`accepted_at` integer,
	`created_at` integer DEFAULT (cast(unixepoch('subsecond') * 1000 as integer)) NOT NULL,
	FOREIGN KEY (`project_id`) REFERENCES `projects`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`invited_by`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE UNIQUE INDEX `invitations_token_uq` ON `invitations` (`token_hash`);--> statement-breakpoint
CREATE INDEX `invitations_project_idx` ON `invitations` (`project_id`);--> statement-breakpoint
CREATE TABLE `organisations` (
	`id` text PRIMARY KEY NOT NULL,
	`name` text NOT NULL,
	`created_at` integer DEFAULT (cast(unixepoch('subsecond') * 1000 as integer)) NOT NULL
);
--> statement-breakpoint
CREATE TABLE `project_members` (
	`project_id` text NOT NULL,
	`user_id` text NOT NULL,
	`role` text NOT NULL,
	`created_at` integer DEFAULT (cast(unixepoch('subsecond') * 1000 as integer)) NOT NULL,
	PRIMARY KEY(`project_id`, `user_id`),
	FOREIGN KEY (`project_id`) REFERENCES `projects`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`user_id`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE cascade,
	CONSTRAINT "project_members_role_ck" CHECK("project_members"."role" IN ('lead','field_geologist','lab_analyst','consultant'))
);
--> statement-breakpoint
CREATE INDEX `project_members_user_idx` ON `project_members` (`user_id`);--> statement-breakpoint
CREATE TABLE `projects` (
	`id` text PRIMARY KEY NOT NULL,
	`organisation_id` text NOT NULL,
	`code` text NOT NULL,
	`name` text NOT NULL,
	`description` text,
	`region` text,
	`sample_seq` integer DEFAULT 0 NOT NULL,
	`station_seq` integer DEFAULT 0 NOT NULL,
	`submission_seq` integer DEFAULT 0 NOT NULL,
	`lab_email` text,
	`created_at` integer DEFAULT (cast(unixepoch('subsecond') * 1000 as integer)) NOT NULL,
	`updated_at` integer DEFAULT (cast(unixepoch('subsecond') * 1000 as integer)) NOT NULL,
	FOREIGN KEY (`organisation_id`) REFERENCES `organisations`(`id`) ON UPDATE no action ON DELETE restrict,
	CONSTRAINT "projects_code_ck" CHECK("projects"."code" GLOB '[A-Z][A-Z0-9]*' AND length("projects"."code") BETWEEN 2 AND 8)
);
--> statement-breakpoint
CREATE UNIQUE INDEX `projects_code_uq` ON `projects` (`code`);--> statement-breakpoint
CREATE TABLE `photos` (
	`id` text PRIMARY KEY NOT NULL,
	`project_id` text NOT NULL,
	`sample_id` text,
	`station_id` text,
	`storage_key` text NOT NULL,
	`thumb_key` text,
	`display_key` text,
	`original_name` text NOT NULL,
	`mime` text NOT NULL,
	`size_bytes` integer NOT NULL,
	`sha256` text NOT NULL,
	`width` integer,
	`height` integer,
	`taken_at` text,
	`gps_lat` real,
	`gps_lon` real,
	`gps_altitude_m` real,
	`img_direction` real,
	`orientation` integer,
	`caption` text,
	`uploaded_by` text,
	`created_at` integer DEFAULT (cast(unixepoch('subsecond') * 1000 as integer)) NOT NULL,
	FOREIGN KEY (`project_id`) REFERENCES `projects`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`sample_id`) REFERENCES `samples`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`station_id`) REFERENCES `stations`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`uploaded_by`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE set null,
	CONSTRAINT "photos_owner_ck" CHECK("photos"."sample_id" IS NOT NULL OR "photos"."station_id" IS NOT NULL)
);
--> statement-breakpoint
CREATE INDEX `photos_sample_idx` ON `photos` (`sample_id`);--> statement-breakpoint
CREATE INDEX `photos_station_idx` ON `photos` (`station_id`);--> statement-breakpoint
CREATE INDEX `photos_project_idx` ON `photos` (`project_id`);--> statement-breakpoint
CREATE TABLE `samples` (
	`id` text PRIMARY KEY NOT NULL,
	`project_id` text NOT NULL,
	`code` text NOT NULL,
	`igsn` text,
	`parent_id` text,
	`station_id` text,
	`sample_type` text NOT NULL,
	`lithology` text,
	`alteration` text,
	`alteration_intensity` text,
	`description` text,
	`collected_at` text,
	`collected_tz` text,
	`collector_name` text,
	`collector_id` text,
	`lat` real,
	`lon` real,
	`elevation_m` real,
	`horizontal_accuracy_m` real,
	`location_source` text,
	`storage_location` text,
	`status` text DEFAULT 'collected' NOT NULL,
	`suspected_asbestos` integer DEFAULT false NOT NULL,
	`weight_kg` real,
	`version` integer DEFAULT 1 NOT NULL,
	`created_by` text,
	`created_at` integer DEFAULT (cast(unixepoch('subsecond') * 1000 as integer)) NOT NULL,
	`updated_at` integer DEFAULT (cast(unixepoch('subsecond') * 1000 as integer)) NOT NULL,
	FOREIGN KEY (`project_id`) REFERENCES `projects`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`station_id`) REFERENCES `stations`(`id`) ON UPDATE no action ON DELETE set null,
	FOREIGN KEY (`collector_id`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE set null,
	FOREIGN KEY (`created_by`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE set null,
	CONSTRAINT "samples_lat_ck" CHECK("samples"."lat" IS NULL OR "samples"."lat" BETWEEN -90 AND 90),
	CONSTRAINT "samples_lon_ck" CHECK("samples"."lon" IS NULL OR "samples"."lon" BETWEEN -180 AND 180),
	CONSTRAINT "samples_type_ck" CHECK("samples"."sample_type" IN ('hand_sample','chip','channel','float','core','soil','stream_sediment','other')),
	CONSTRAINT "samples_status_ck" CHECK("samples"."status" IN ('planned','collected','dispatched','received','prepared','scanned','processed','confirmed','reported','stored','returned','discarded')),
	CONSTRAINT "samples_version_ck" CHECK("samples"."version" >= 1)
);
--> statement-breakpoint
CREATE UNIQUE INDEX `samples_project_code_uq` ON `samples` (`project_id`,`code`);--> statement-breakpoint
CREATE UNIQUE INDEX `samples_igsn_uq` ON `samples` (`igsn`);--> statement-breakpoint
CREATE INDEX `samples_project_station_idx` ON `samples` (`project_id`,`station_id`);--> statement-breakpoint
CREATE INDEX `samples_project_status_idx` ON `samples` (`project_id`,`status`);--> statement-breakpoint
CREATE INDEX `samples_project_collected_idx` ON `samples` (`project_id`,`collected_at`);--> statement-breakpoint
CREATE INDEX `samples_project_latlon_idx` ON `samples` (`project_id`,`lat`,`lon`);--> statement-breakpoint
CREATE INDEX `samples_parent_idx` ON `samples` (`parent_id`);--> statement-breakpoint
CREATE TABLE `stations` (
	`id` text PRIMARY KEY NOT NULL,
	`project_id` text NOT NULL,
	`code` text NOT NULL,
	`name` text,
	`lat` real NOT NULL,
	`lon` real NOT NULL,
	`elevation_m` real,
	`elevation_ref` text,
	`horizontal_accuracy_m` real,
	`location_source` text,
	`description` text,
	`lithology` text,
	`observed_at` text,
	`created_by` text,
	`version` integer DEFAULT 1 NOT NULL,
	`created_at` integer DEFAULT (cast(unixepoch('subsecond') * 1000 as integer)) NOT NULL,
	`updated_at` integer DEFAULT (cast(unixepoch('subsecond') * 1000 as integer)) NOT NULL,
	FOREIGN KEY (`project_id`) REFERENCES `projects`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`created_by`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE set null,
	CONSTRAINT "stations_lat_ck" CHECK("stations"."lat" BETWEEN -90 AND 90),
	CONSTRAINT "stations_lon_ck" CHECK("stations"."lon" BETWEEN -180 AND 180),
	CONSTRAINT "stations_acc_ck" CHECK("stations"."horizontal_accuracy_m" IS NULL OR "stations"."horizontal_accuracy_m" >= 0)
);
--> statement-breakpoint
CREATE UNIQUE INDEX `stations_project_code_uq` ON `stations` (`project_id`,`code`);--> statement-breakpoint
CREATE INDEX `stations_project_latlon_idx` ON `stations` (`project_id`,`lat`,`lon`);--> statement-breakpoint
CREATE TABLE `structures` (
	`id` text PRIMARY KEY NOT NULL,
	`station_id` text NOT NULL,
	`kind` text NOT NULL,
	`feature` text NOT NULL,
	`dip_direction` real,
	`dip` real,
	`trend` real,
	`plunge` real,
	`convention` text NOT NULL,
	`note` text,
	`created_by` text,
	`created_at` integer DEFAULT (cast(unixepoch('subsecond') * 1000 as integer)) NOT NULL,
	FOREIGN KEY (`station_id`) REFERENCES `stations`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`created_by`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE set null,
	CONSTRAINT "structures_planar_ck" CHECK("structures"."kind" <> 'planar' OR ("structures"."dip_direction" >= 0 AND "structures"."dip_direction" < 360 AND "structures"."dip" BETWEEN 0 AND 90)),
	CONSTRAINT "structures_linear_ck" CHECK("structures"."kind" <> 'linear' OR ("structures"."trend" >= 0 AND "structures"."trend" < 360 AND "structures"."plunge" BETWEEN 0 AND 90))
);
--> statement-breakpoint
CREATE INDEX `structures_station_idx` ON `structures` (`station_id`);--> statement-breakpoint
CREATE TABLE `custody_events` (
	`id` text PRIMARY KEY NOT NULL,
	`sample_id` text NOT NULL,
	`submission_id` text,
	`event` text NOT NULL,
	`actor_id` text,
	`actor_name` text,
	`occurred_at` text NOT NULL,
	`location` text,
	`seal_number` text,
	`condition` text,
	`weight_kg` real,
	`note` text,
	`created_at` integer DEFAULT (cast(unixepoch('subsecond') * 1000 as integer)) NOT NULL,
	FOREIGN KEY (`sample_id`) REFERENCES `samples`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`submission_id`) REFERENCES `submissions`(`id`) ON UPDATE no action ON DELETE set null,
	FOREIGN KEY (`actor_id`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE INDEX `custody_sample_idx` ON `custody_events` (`sample_id`,`occurred_at`);--> statement-breakpoint
CREATE INDEX `custody_submission_idx` ON `custody_events` (`submission_id`);--> statement-breakpoint
CREATE TABLE `submission_samples` (
	`submission_id` text NOT NULL,
	`sample_id` text NOT NULL,
	`intake_condition` text,
	PRIMARY KEY(`submission_id`, `sample_id`),
	FOREIGN KEY (`submission_id`) REFERENCES `submissions`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`sample_id`) REFERENCES `samples`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE INDEX `submission_samples_sample_idx` ON `submission_samples` (`sample_id`);--> statement-breakpoint
CREATE TABLE `submissions` (
	`id` text PRIMARY KEY NOT NULL,
	`project_id` text NOT NULL,
	`code` text NOT NULL,
	`requested_analysis` text NOT NULL,
	`priority` text DEFAULT 'routine' NOT NULL,
	`hazards` text,
	`notes` text,
	`lab_email` text,
	`status` text DEFAULT 'draft' NOT NULL,
	`waybill` text,
	`created_by` text,
	`sent_at` integer,
	`created_at` integer DEFAULT (cast(unixepoch('subsecond') * 1000 as integer)) NOT NULL,
	`updated_at` integer DEFAULT (cast(unixepoch('subsecond') * 1000 as integer)) NOT NULL,
	FOREIGN KEY (`project_id`) REFERENCES `projects`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`created_by`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE set null,
	CONSTRAINT "submissions_priority_ck" CHECK("submissions"."priority" IN ('routine','high','urgent'))
);
--> statement-breakpoint
CREATE UNIQUE INDEX `submissions_project_code_uq` ON `submissions` (`project_id`,`code`);--> statement-breakpoint
CREATE INDEX `submissions_project_status_idx` ON `submissions` (`project_id`,`status`);--> statement-breakpoint
CREATE TABLE `peaks` (
	`id` text PRIMARY KEY NOT NULL,
	`run_id` text NOT NULL,
	`two_theta` real NOT NULL,
	`d` real NOT NULL,
	`height` real NOT NULL,
	`area` real,
	`fwhm` real,
	`fwhm_esd` real,
	`rel_intensity` real NOT NULL,
	`crystallite_nm` real,
	FOREIGN KEY (`run_id`) REFERENCES `processing_runs`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE INDEX `peaks_run_idx` ON `peaks` (`run_id`,`two_theta`);--> statement-breakpoint
CREATE TABLE `phase_results` (
	`id` text PRIMARY KEY NOT NULL,
	`run_id` text NOT NULL,
	`scan_id` text NOT NULL,
	`reference_phase_id` text NOT NULL,
	`rank` integer,
	`score` real,
	`confident` integer DEFAULT false NOT NULL,
	`wt_percent` real,
	`matched_json` text,
	`source` text DEFAULT 'auto' NOT NULL,
	`status` text DEFAULT 'candidate' NOT NULL,
	`decided_by` text,
	`decided_at` integer,
	`note` text,
	`created_at` integer DEFAULT (cast(unixepoch('subsecond') * 1000 as integer)) NOT NULL,
	FOREIGN KEY (`run_id`) REFERENCES `processing_runs`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`scan_id`) REFERENCES `scans`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`reference_phase_id`) REFERENCES `reference_phases`(`id`) ON UPDATE no action ON DELETE restrict,
	FOREIGN KEY (`decided_by`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE set null,
	CONSTRAINT "phase_results_wt_ck" CHECK("phase_results"."wt_percent" IS NULL OR "phase_results"."wt_percent" BETWEEN 0 AND 100)
);
--> statement-breakpoint
CREATE INDEX `phase_results_run_idx` ON `phase_results` (`run_id`,`rank`);--> statement-breakpoint
CREATE INDEX `phase_results_scan_status_idx` ON `phase_results` (`scan_id`,`status`);--> statement-breakpoint
CREATE INDEX `phase_results_reference_idx` ON `phase_results` (`reference_phase_id`);--> statement-breakpoint
CREATE TABLE `processing_runs` (
	`id` text PRIMARY KEY NOT NULL,
	`scan_id` text NOT NULL,
	`params_json` text NOT NULL,
	`software_version` text NOT NULL,
	`status` text DEFAULT 'queued' NOT NULL,
	`error` text,
	`profile_json` text,
	`unexplained_json` text,
	`duration_ms` integer,
	`created_by` text,
	`created_at` integer DEFAULT (cast(unixepoch('subsecond') * 1000 as integer)) NOT NULL,
	FOREIGN KEY (`scan_id`) REFERENCES `scans`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`created_by`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE INDEX `runs_scan_idx` ON `processing_runs` (`scan_id`,`created_at`);--> statement-breakpoint
CREATE TABLE `reference_phases` (
	`id` text PRIMARY KEY NOT NULL,
	`mineral` text NOT NULL,
	`formula` text NOT NULL,
	`mineral_group` text,
	`crystal_system` text NOT NULL,
	`space_group` text NOT NULL,
	`cell_a` real NOT NULL,
	`cell_b` real NOT NULL,
	`cell_c` real NOT NULL,
	`cell_alpha` real NOT NULL,
	`cell_beta` real NOT NULL,
	`cell_gamma` real NOT NULL,
	`elements` text NOT NULL,
	`hazard` text,
	`citation` text NOT NULL,
	`cif_text` text NOT NULL,
	`pattern_json` text NOT NULL,
	`rir` real,
	`builtin` integer DEFAULT false NOT NULL,
	`imported_by` text,
	`created_at` integer DEFAULT (cast(unixepoch('subsecond') * 1000 as integer)) NOT NULL,
	FOREIGN KEY (`imported_by`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE UNIQUE INDEX `reference_mineral_uq` ON `reference_phases` (`mineral`,`builtin`,`cell_a`);--> statement-breakpoint
CREATE INDEX `reference_mineral_idx` ON `reference_phases` (`mineral`);--> statement-breakpoint
CREATE TABLE `scans` (
	`id` text PRIMARY KEY NOT NULL,
	`project_id` text NOT NULL,
	`sample_id` text NOT NULL,
	`file_key` text NOT NULL,
	`original_name` text NOT NULL,
	`sha256` text NOT NULL,
	`format` text NOT NULL,
	`anode` text,
	`wavelength_a` real NOT NULL,
	`wavelength2_a` real,
	`instrument` text,
	`settings_json` text,
	`two_theta_start` real,
	`two_theta_end` real,
	`step_deg` real,
	`point_count` integer,
	`status` text DEFAULT 'uploaded' NOT NULL,
	`error` text,
	`current_run_id` text,
	`analyst_note` text,
	`uploaded_by` text,
	`signed_off_by` text,
	`signed_off_at` integer,
	`created_at` integer DEFAULT (cast(unixepoch('subsecond') * 1000 as integer)) NOT NULL,
	FOREIGN KEY (`project_id`) REFERENCES `projects`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`sample_id`) REFERENCES `samples`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`uploaded_by`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE set null,
	FOREIGN KEY (`signed_off_by`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE set null,
	CONSTRAINT "scans_wavelength_ck" CHECK("scans"."wavelength_a" > 0.1 AND "scans"."wavelength_a" < 5)
);
--> statement-breakpoint
CREATE INDEX `scans_sample_idx` ON `scans` (`sample_id`);--> statement-breakpoint
CREATE INDEX `scans_project_status_idx` ON `scans` (`project_id`,`status`);--> statement-breakpoint
CREATE TABLE `audit_log` (
	`id` text PRIMARY KEY NOT NULL,
	`project_id` text,
	`actor_id` text,
	`action` text NOT NULL,
	`entity` text NOT NULL,
	`entity_id` text NOT NULL,
	`before_json` text,
	`after_json` text,
	`created_at` integer DEFAULT (cast(unixepoch('subsecond') * 1000 as integer)) NOT NULL,
	FOREIGN KEY (`project_id`) REFERENCES `projects`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`actor_id`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE INDEX `audit_project_idx` ON `audit_log` (`project_id`,`created_at`);--> statement-breakpoint
CREATE INDEX `audit_entity_idx` ON `audit_log` (`entity`,`entity_id`);--> statement-breakpoint
CREATE TABLE `share_links` (
	`id` text PRIMARY KEY NOT NULL,
	`project_id` text NOT NULL,
	`token_hash` text NOT NULL,
	`filter_json` text NOT NULL,
	`label` text,
	`expires_at` integer NOT NULL,
	`revoked_at` integer,
	`created_by` text,
	`created_at` integer DEFAULT (cast(unixepoch('subsecond') * 1000 as integer)) NOT NULL,
	FOREIGN KEY (`project_id`) REFERENCES `projects`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`created_by`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE UNIQUE INDEX `share_links_token_hash_unique` ON `share_links` (`token_hash`);--> statement-breakpoint
CREATE INDEX `share_links_project_idx` ON `share_links` (`project_id`);--> statement-breakpoint
CREATE TABLE `tile_packages` (
	`id` text PRIMARY KEY NOT NULL,
	`project_id` text NOT NULL,
	`name` text NOT NULL,
	`storage_key` text NOT NULL,
	`format` text NOT NULL,
	`min_zoom` integer,
	`max_zoom` integer,
	`bounds` text,
	`attribution` text,
	`uploaded_by` text,
	`created_at` integer DEFAULT (cast(unixepoch('subsecond') * 1000 as integer)) NOT NULL,
	FOREIGN KEY (`project_id`) REFERENCES `projects`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`uploaded_by`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE INDEX `tile_packages_project_idx` ON `tile_packages` (`project_id`);