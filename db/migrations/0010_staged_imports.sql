CREATE TABLE `import_runs` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`host` text NOT NULL,
	`pid` integer NOT NULL,
	`owner` text NOT NULL,
	`started_at` text NOT NULL,
	`heartbeat_at` text NOT NULL,
	`finished_at` text
);
--> statement-breakpoint
CREATE TABLE `measurement_staging` (
	`run_id` integer NOT NULL,
	`target_id` integer NOT NULL,
	`block_id` integer,
	`kind` text NOT NULL,
	`component` text DEFAULT 'relative' NOT NULL,
	`epoch` text NOT NULL,
	`epoch_jd` real NOT NULL,
	`d_ra_mas` real,
	`d_dec_mas` real,
	`sigma_d_ra_mas` real,
	`sigma_d_dec_mas` real,
	`separation_mas` real,
	`position_angle_deg` real,
	`sigma_separation_mas` real,
	`sigma_position_angle_deg` real,
	`correlation` real,
	`radial_velocity_km_s` real,
	`sigma_radial_velocity_km_s` real,
	`instrument` text NOT NULL,
	`notes` text DEFAULT '' NOT NULL,
	`created_at` text NOT NULL,
	`updated_at` text NOT NULL,
	FOREIGN KEY (`run_id`) REFERENCES `import_runs`(`id`) ON UPDATE no action ON DELETE cascade
);
