CREATE TABLE `job_run` (
	`id` text PRIMARY KEY NOT NULL,
	`job_id` text NOT NULL,
	`attempt` integer NOT NULL,
	`printer_id` text NOT NULL,
	`started_at` integer NOT NULL,
	`finished_at` integer,
	`estimated_hours_at_start` real NOT NULL,
	`efficiency_at_start` real NOT NULL,
	`actual_hours` real,
	`filament_used_grams` real,
	`outcome` text,
	`failure_reason` text,
	`notes` text,
	`started_by_id` text,
	`finished_by_id` text,
	FOREIGN KEY (`job_id`) REFERENCES `job`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`printer_id`) REFERENCES `printer`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`started_by_id`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`finished_by_id`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE no action,
	CONSTRAINT "job_run_failure_reason" CHECK("job_run"."outcome" is not 'failed' or "job_run"."failure_reason" is not null)
);
--> statement-breakpoint
CREATE UNIQUE INDEX `job_run_attempt_idx` ON `job_run` (`job_id`,`attempt`);--> statement-breakpoint
CREATE UNIQUE INDEX `job_run_one_open_idx` ON `job_run` (`job_id`) WHERE "job_run"."outcome" is null;--> statement-breakpoint
CREATE INDEX `job_run_printer_idx` ON `job_run` (`printer_id`,`outcome`);--> statement-breakpoint
CREATE TABLE `lab_closure` (
	`id` text PRIMARY KEY NOT NULL,
	`starts_at` integer NOT NULL,
	`ends_at` integer NOT NULL,
	`reason` text NOT NULL,
	`created_at` integer NOT NULL,
	CONSTRAINT "lab_closure_order" CHECK("lab_closure"."ends_at" > "lab_closure"."starts_at")
);
--> statement-breakpoint
CREATE INDEX `lab_closure_start_idx` ON `lab_closure` (`starts_at`);--> statement-breakpoint
CREATE TABLE `lab_start_window` (
	`id` text PRIMARY KEY NOT NULL,
	`iso_weekday` integer NOT NULL,
	`start_minute` integer NOT NULL,
	`end_minute` integer NOT NULL,
	`created_at` integer NOT NULL,
	CONSTRAINT "lab_start_window_day" CHECK("lab_start_window"."iso_weekday" between 1 and 7),
	CONSTRAINT "lab_start_window_minutes" CHECK("lab_start_window"."start_minute" >= 0 and "lab_start_window"."end_minute" > "lab_start_window"."start_minute" and "lab_start_window"."end_minute" <= 1440)
);
--> statement-breakpoint
CREATE INDEX `lab_start_window_day_idx` ON `lab_start_window` (`iso_weekday`,`start_minute`);--> statement-breakpoint
CREATE TABLE `printer_maintenance` (
	`id` text PRIMARY KEY NOT NULL,
	`printer_id` text NOT NULL,
	`starts_at` integer NOT NULL,
	`ends_at` integer NOT NULL,
	`reason` text NOT NULL,
	`created_at` integer NOT NULL,
	FOREIGN KEY (`printer_id`) REFERENCES `printer`(`id`) ON UPDATE no action ON DELETE cascade,
	CONSTRAINT "printer_maintenance_order" CHECK("printer_maintenance"."ends_at" > "printer_maintenance"."starts_at")
);
--> statement-breakpoint
CREATE INDEX `printer_maintenance_printer_idx` ON `printer_maintenance` (`printer_id`,`starts_at`);--> statement-breakpoint
ALTER TABLE `campaign` ADD `estimated_results_at` integer;--> statement-breakpoint
ALTER TABLE `campaign` ADD `scheduled_notified_at` integer;--> statement-breakpoint
ALTER TABLE `campaign` ADD `last_notified_results_at` integer;--> statement-breakpoint
ALTER TABLE `job` ADD `pinned` integer DEFAULT false NOT NULL;--> statement-breakpoint
ALTER TABLE `job` ADD `position` integer;--> statement-breakpoint
ALTER TABLE `job` ADD `chosen_printer_id` text REFERENCES printer(id);--> statement-breakpoint
ALTER TABLE `job` ADD `scheduled_changeover_start` integer;--> statement-breakpoint
ALTER TABLE `job` ADD `scheduled_end` integer;--> statement-breakpoint
ALTER TABLE `job` ADD `unplaced_reason` text;--> statement-breakpoint
ALTER TABLE `job` ADD `size_x_mm` real;--> statement-breakpoint
ALTER TABLE `job` ADD `size_y_mm` real;--> statement-breakpoint
ALTER TABLE `job` ADD `size_z_mm` real;--> statement-breakpoint
CREATE INDEX `job_state_idx` ON `job` (`state`,`campaign_id`);--> statement-breakpoint
ALTER TABLE `lab_settings` ADD `slip_notice_days` integer DEFAULT 2 NOT NULL;--> statement-breakpoint
ALTER TABLE `lab_settings` ADD `calendar_feed_token` text;