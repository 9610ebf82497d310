-- Which body a measurement is of (the secondary relative to the primary unless said otherwise),
-- and each site's humidity and wavelength for refraction (null: 50 % and 2.2 µm).
ALTER TABLE `measurements` ADD `component` text DEFAULT 'relative' NOT NULL;--> statement-breakpoint
ALTER TABLE `sites` ADD `humidity_pct` real;--> statement-breakpoint
ALTER TABLE `sites` ADD `wavelength_um` real;
