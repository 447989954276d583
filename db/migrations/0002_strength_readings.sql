CREATE TABLE `strength_readings` (
	`id` text PRIMARY KEY NOT NULL,
	`clinic_id` text NOT NULL,
	`client_id` text NOT NULL,
	`test` text NOT NULL,
	`side` text NOT NULL,
	`trials_kg` text NOT NULL,
	`mean_kg` real NOT NULL,
	`handle_position` integer,
	`visit_id` text,
	`note` text DEFAULT '' NOT NULL,
	`recorded_by_user_id` text,
	`recorded_at` integer NOT NULL,
	`created_at` integer NOT NULL,
	FOREIGN KEY (`clinic_id`) REFERENCES `clinics`(`id`) ON UPDATE no action ON DELETE restrict,
	FOREIGN KEY (`client_id`) REFERENCES `clients`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`visit_id`) REFERENCES `visits`(`id`) ON UPDATE no action ON DELETE set null,
	FOREIGN KEY (`recorded_by_user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE INDEX `strength_readings_client_idx` ON `strength_readings` (`client_id`,`test`,`side`);--> statement-breakpoint
CREATE INDEX `strength_readings_clinic_idx` ON `strength_readings` (`clinic_id`);--> statement-breakpoint
CREATE INDEX `strength_readings_visit_idx` ON `strength_readings` (`visit_id`);