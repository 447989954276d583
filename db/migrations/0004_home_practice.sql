CREATE TABLE `home_program_items` (
	`id` text PRIMARY KEY NOT NULL,
	`clinic_id` text NOT NULL,
	`client_id` text NOT NULL,
	`motion` text NOT NULL,
	`side` text NOT NULL,
	`digit` text,
	`condition` text NOT NULL,
	`repetitions` integer NOT NULL,
	`sessions_per_period` integer NOT NULL,
	`period` text NOT NULL,
	`start_date` text NOT NULL,
	`end_date` text NOT NULL,
	`notes` text DEFAULT '' NOT NULL,
	`assigned_by_user_id` text,
	`ended_at` integer,
	`ended_by_user_id` text,
	`created_at` integer NOT NULL,
	`updated_at` integer NOT NULL,
	FOREIGN KEY (`clinic_id`) REFERENCES `clinics`(`id`) ON UPDATE no action ON DELETE restrict,
	FOREIGN KEY (`client_id`) REFERENCES `clients`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`assigned_by_user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null,
	FOREIGN KEY (`ended_by_user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE INDEX `home_program_items_client_idx` ON `home_program_items` (`client_id`);--> statement-breakpoint
CREATE INDEX `home_program_items_clinic_idx` ON `home_program_items` (`clinic_id`);--> statement-breakpoint
CREATE INDEX `home_program_items_assigned_by_idx` ON `home_program_items` (`assigned_by_user_id`);--> statement-breakpoint
CREATE INDEX `home_program_items_ended_by_idx` ON `home_program_items` (`ended_by_user_id`);--> statement-breakpoint
CREATE TABLE `practice_sessions` (
	`id` text PRIMARY KEY NOT NULL,
	`clinic_id` text NOT NULL,
	`client_id` text NOT NULL,
	`item_id` text NOT NULL,
	`started_at` integer NOT NULL,
	`local_date` text NOT NULL,
	`created_at` integer NOT NULL,
	FOREIGN KEY (`clinic_id`) REFERENCES `clinics`(`id`) ON UPDATE no action ON DELETE restrict,
	FOREIGN KEY (`client_id`) REFERENCES `clients`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`item_id`) REFERENCES `home_program_items`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE INDEX `practice_sessions_client_date_idx` ON `practice_sessions` (`client_id`,`local_date`);--> statement-breakpoint
CREATE INDEX `practice_sessions_item_idx` ON `practice_sessions` (`item_id`);--> statement-breakpoint
CREATE INDEX `practice_sessions_clinic_idx` ON `practice_sessions` (`clinic_id`);