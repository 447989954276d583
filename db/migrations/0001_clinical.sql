CREATE TABLE `attempt_captures` (
	`attempt_id` text PRIMARY KEY NOT NULL,
	`gzip` blob NOT NULL,
	`sha256` text NOT NULL,
	`bytes` integer NOT NULL,
	FOREIGN KEY (`attempt_id`) REFERENCES `attempts`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE TABLE `attempts` (
	`id` text PRIMARY KEY NOT NULL,
	`capture_uid` text NOT NULL,
	`clinic_id` text NOT NULL,
	`client_id` text NOT NULL,
	`motion` text NOT NULL,
	`side` text NOT NULL,
	`digit` text,
	`condition` text NOT NULL,
	`source` text NOT NULL,
	`visit_id` text,
	`practice_session_id` text,
	`recorded_by_user_id` text,
	`recorded_at` integer NOT NULL,
	`frames` integer NOT NULL,
	`usable_frames` integer NOT NULL,
	`reps` integer NOT NULL,
	`start_deg` real,
	`peak_deg` real,
	`arc_deg` real,
	`uncertainty_deg` real,
	`plane_verdict` text NOT NULL,
	`axis_to_gravity_deg` real,
	`plane_verified` integer NOT NULL,
	`method` text,
	`engine_version` text NOT NULL,
	`correction_version` text,
	`warnings` text DEFAULT '[]' NOT NULL,
	`kept_at` integer,
	`kept_by_user_id` text,
	`created_at` integer NOT NULL,
	FOREIGN KEY (`clinic_id`) REFERENCES `clinics`(`id`) ON UPDATE no action ON DELETE restrict,
	FOREIGN KEY (`client_id`) REFERENCES `clients`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`visit_id`) REFERENCES `visits`(`id`) ON UPDATE no action ON DELETE set null,
	FOREIGN KEY (`recorded_by_user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null,
	FOREIGN KEY (`kept_by_user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE UNIQUE INDEX `attempts_capture_uid_unique` ON `attempts` (`capture_uid`);--> statement-breakpoint
CREATE INDEX `attempts_client_motion_idx` ON `attempts` (`client_id`,`motion`,`side`,`digit`);--> statement-breakpoint
CREATE INDEX `attempts_clinic_idx` ON `attempts` (`clinic_id`);--> statement-breakpoint
CREATE INDEX `attempts_visit_idx` ON `attempts` (`visit_id`);--> statement-breakpoint
CREATE TABLE `consents` (
	`id` text PRIMARY KEY NOT NULL,
	`client_id` text NOT NULL,
	`kind` text NOT NULL,
	`version` text NOT NULL,
	`text_sha256` text NOT NULL,
	`signed_name` text NOT NULL,
	`signed_by_user_id` text,
	`signed_at` integer NOT NULL,
	`address` text,
	FOREIGN KEY (`client_id`) REFERENCES `clients`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`signed_by_user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE INDEX `consents_client_idx` ON `consents` (`client_id`);--> statement-breakpoint
CREATE TABLE `grade_entries` (
	`id` text PRIMARY KEY NOT NULL,
	`clinic_id` text NOT NULL,
	`client_id` text NOT NULL,
	`motion` text NOT NULL,
	`side` text NOT NULL,
	`digit` text,
	`scale` text NOT NULL,
	`value` text,
	`method` text NOT NULL,
	`basis` text,
	`in_person_reasons` text DEFAULT '[]' NOT NULL,
	`visit_id` text,
	`note` text DEFAULT '' NOT NULL,
	`recorded_by_user_id` text,
	`recorded_by_role` text NOT NULL,
	`recorded_at` integer NOT NULL,
	`status` text NOT NULL,
	`signed_by_user_id` text,
	`signed_at` integer,
	`replaces_id` text,
	FOREIGN KEY (`clinic_id`) REFERENCES `clinics`(`id`) ON UPDATE no action ON DELETE restrict,
	FOREIGN KEY (`client_id`) REFERENCES `clients`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`visit_id`) REFERENCES `visits`(`id`) ON UPDATE no action ON DELETE set null,
	FOREIGN KEY (`recorded_by_user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null,
	FOREIGN KEY (`signed_by_user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE INDEX `grades_client_motion_idx` ON `grade_entries` (`client_id`,`motion`,`side`,`digit`);--> statement-breakpoint
CREATE INDEX `grades_clinic_status_idx` ON `grade_entries` (`clinic_id`,`status`);--> statement-breakpoint
CREATE INDEX `grades_replaces_idx` ON `grade_entries` (`replaces_id`);--> statement-breakpoint
CREATE TABLE `passive_ranges` (
	`id` text PRIMARY KEY NOT NULL,
	`clinic_id` text NOT NULL,
	`client_id` text NOT NULL,
	`motion` text NOT NULL,
	`side` text NOT NULL,
	`digit` text,
	`value_deg` real NOT NULL,
	`measured_at` integer NOT NULL,
	`measured_by_user_id` text,
	`note` text DEFAULT '' NOT NULL,
	`created_at` integer NOT NULL,
	FOREIGN KEY (`clinic_id`) REFERENCES `clinics`(`id`) ON UPDATE no action ON DELETE restrict,
	FOREIGN KEY (`client_id`) REFERENCES `clients`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`measured_by_user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE INDEX `passive_ranges_client_motion_idx` ON `passive_ranges` (`client_id`,`motion`,`side`,`digit`);--> statement-breakpoint
CREATE TABLE `visits` (
	`id` text PRIMARY KEY NOT NULL,
	`clinic_id` text NOT NULL,
	`client_id` text NOT NULL,
	`therapist_id` text NOT NULL,
	`kind` text DEFAULT 'video' NOT NULL,
	`starts_at` integer NOT NULL,
	`duration_min` integer DEFAULT 45 NOT NULL,
	`reason` text DEFAULT '' NOT NULL,
	`location` text,
	`planned_tests` text,
	`status` text DEFAULT 'scheduled' NOT NULL,
	`invitation_sent_at` integer,
	`reminder_sent_at` integer,
	`started_at` integer,
	`ended_at` integer,
	`notes` text DEFAULT '' NOT NULL,
	`summary` text,
	`created_by_user_id` text,
	`created_at` integer NOT NULL,
	`updated_at` integer NOT NULL,
	FOREIGN KEY (`clinic_id`) REFERENCES `clinics`(`id`) ON UPDATE no action ON DELETE restrict,
	FOREIGN KEY (`client_id`) REFERENCES `clients`(`id`) ON UPDATE no action ON DELETE restrict,
	FOREIGN KEY (`therapist_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE restrict,
	FOREIGN KEY (`created_by_user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE INDEX `visits_clinic_starts_idx` ON `visits` (`clinic_id`,`starts_at`);--> statement-breakpoint
CREATE INDEX `visits_client_idx` ON `visits` (`client_id`);--> statement-breakpoint
CREATE INDEX `visits_therapist_starts_idx` ON `visits` (`therapist_id`,`starts_at`);