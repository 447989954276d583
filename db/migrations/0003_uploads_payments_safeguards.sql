CREATE TABLE `client_erasures` (
	`id` text PRIMARY KEY NOT NULL,
	`clinic_id` text NOT NULL,
	`client_id` text NOT NULL,
	`requested_at` integer NOT NULL,
	`erased_at` integer NOT NULL,
	`erased_by_user_id` text,
	`summary` text NOT NULL,
	FOREIGN KEY (`clinic_id`) REFERENCES `clinics`(`id`) ON UPDATE no action ON DELETE restrict,
	FOREIGN KEY (`client_id`) REFERENCES `clients`(`id`) ON UPDATE no action ON DELETE restrict,
	FOREIGN KEY (`erased_by_user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE UNIQUE INDEX `client_erasures_client_id_unique` ON `client_erasures` (`client_id`);--> statement-breakpoint
CREATE INDEX `client_erasures_clinic_idx` ON `client_erasures` (`clinic_id`);--> statement-breakpoint
CREATE INDEX `client_erasures_by_idx` ON `client_erasures` (`erased_by_user_id`);--> statement-breakpoint
CREATE TABLE `payment_events` (
	`event_id` text PRIMARY KEY NOT NULL,
	`type` text NOT NULL,
	`received_at` integer NOT NULL
);
--> statement-breakpoint
CREATE TABLE `payments` (
	`id` text PRIMARY KEY NOT NULL,
	`clinic_id` text NOT NULL,
	`visit_id` text NOT NULL,
	`client_id` text NOT NULL,
	`amount_minor` integer NOT NULL,
	`currency` text NOT NULL,
	`status` text DEFAULT 'pending' NOT NULL,
	`checkout_session_id` text NOT NULL,
	`checkout_url` text,
	`payment_intent_id` text,
	`refund_id` text,
	`paid_at` integer,
	`refunded_at` integer,
	`receipt_sent_at` integer,
	`created_by_user_id` text,
	`created_at` integer NOT NULL,
	`updated_at` integer NOT NULL,
	FOREIGN KEY (`clinic_id`) REFERENCES `clinics`(`id`) ON UPDATE no action ON DELETE restrict,
	FOREIGN KEY (`visit_id`) REFERENCES `visits`(`id`) ON UPDATE no action ON DELETE restrict,
	FOREIGN KEY (`client_id`) REFERENCES `clients`(`id`) ON UPDATE no action ON DELETE restrict,
	FOREIGN KEY (`created_by_user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE UNIQUE INDEX `payments_checkout_session_id_unique` ON `payments` (`checkout_session_id`);--> statement-breakpoint
CREATE INDEX `payments_visit_idx` ON `payments` (`visit_id`);--> statement-breakpoint
CREATE INDEX `payments_client_idx` ON `payments` (`client_id`);--> statement-breakpoint
CREATE INDEX `payments_clinic_idx` ON `payments` (`clinic_id`,`status`);--> statement-breakpoint
CREATE INDEX `payments_creator_idx` ON `payments` (`created_by_user_id`);--> statement-breakpoint
CREATE TABLE `staff_activity` (
	`user_id` text PRIMARY KEY NOT NULL,
	`last_active_at` integer NOT NULL,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE TABLE `uploads` (
	`id` text PRIMARY KEY NOT NULL,
	`upload_uid` text NOT NULL,
	`clinic_id` text NOT NULL,
	`client_id` text NOT NULL,
	`kind` text NOT NULL,
	`media_type` text NOT NULL,
	`extension` text NOT NULL,
	`original_name` text NOT NULL,
	`bytes` integer NOT NULL,
	`sha256` text NOT NULL,
	`storage_key` text NOT NULL,
	`note` text DEFAULT '' NOT NULL,
	`motion` text,
	`side` text,
	`digit` text,
	`attempt_id` text,
	`uploaded_by_user_id` text,
	`uploaded_by_role` text NOT NULL,
	`reviewed_at` integer,
	`reviewed_by_user_id` text,
	`created_at` integer NOT NULL,
	FOREIGN KEY (`clinic_id`) REFERENCES `clinics`(`id`) ON UPDATE no action ON DELETE restrict,
	FOREIGN KEY (`client_id`) REFERENCES `clients`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`attempt_id`) REFERENCES `attempts`(`id`) ON UPDATE no action ON DELETE set null,
	FOREIGN KEY (`uploaded_by_user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null,
	FOREIGN KEY (`reviewed_by_user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE UNIQUE INDEX `uploads_upload_uid_unique` ON `uploads` (`upload_uid`);--> statement-breakpoint
CREATE INDEX `uploads_client_idx` ON `uploads` (`client_id`,`created_at`);--> statement-breakpoint
CREATE INDEX `uploads_clinic_idx` ON `uploads` (`clinic_id`);--> statement-breakpoint
CREATE INDEX `uploads_attempt_idx` ON `uploads` (`attempt_id`);--> statement-breakpoint
CREATE INDEX `uploads_uploader_idx` ON `uploads` (`uploaded_by_user_id`);--> statement-breakpoint
CREATE INDEX `uploads_reviewer_idx` ON `uploads` (`reviewed_by_user_id`);--> statement-breakpoint
CREATE TABLE `visit_prices` (
	`id` text PRIMARY KEY NOT NULL,
	`clinic_id` text NOT NULL,
	`visit_kind` text NOT NULL,
	`amount_minor` integer NOT NULL,
	`currency` text NOT NULL,
	`label` text NOT NULL,
	`updated_by_user_id` text,
	`created_at` integer NOT NULL,
	`updated_at` integer NOT NULL,
	FOREIGN KEY (`clinic_id`) REFERENCES `clinics`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`updated_by_user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE UNIQUE INDEX `visit_prices_clinic_kind_idx` ON `visit_prices` (`clinic_id`,`visit_kind`);--> statement-breakpoint
CREATE INDEX `visit_prices_updater_idx` ON `visit_prices` (`updated_by_user_id`);