ALTER TABLE `attempts` ADD `camera_view` text;--> statement-breakpoint
ALTER TABLE `attempts` ADD `view_quality` text;--> statement-breakpoint
ALTER TABLE `attempts` ADD `forearm_source` text;