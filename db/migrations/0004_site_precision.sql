-- Each site's expected measurement precision (the season planner's, the flags' and the forecast's):
-- a zenith 1σ per kind and the seeing it holds for. Null means the documented default.
ALTER TABLE `sites` ADD `astrometry_sigma_mas` real;--> statement-breakpoint
ALTER TABLE `sites` ADD `spectroscopy_sigma_km_s` real;--> statement-breakpoint
ALTER TABLE `sites` ADD `reference_seeing_arcsec` real;
