-- Our own words for the observing limits: columns renamed in place (values kept), and the keys of
-- each campaign's stored limits rewritten to the new names.
ALTER TABLE `campaigns` RENAME COLUMN `constraints` TO `limits`;--> statement-breakpoint
UPDATE `campaigns` SET `limits` = json_remove(json_set(`limits`, '$.highestAirmass', json_extract(`limits`, '$.maxAirmass')), '$.maxAirmass') WHERE json_type(`limits`, '$.maxAirmass') IS NOT NULL;--> statement-breakpoint
UPDATE `campaigns` SET `limits` = json_remove(json_set(`limits`, '$.leastMoonDistanceDeg', json_extract(`limits`, '$.minMoonSeparationDeg')), '$.minMoonSeparationDeg') WHERE json_type(`limits`, '$.minMoonSeparationDeg') IS NOT NULL;--> statement-breakpoint
ALTER TABLE `sites` RENAME COLUMN `min_altitude_deg` TO `lowest_altitude_deg`;--> statement-breakpoint
ALTER TABLE `sites` RENAME COLUMN `sun_avoidance_deg` TO `least_sun_distance_deg`;
