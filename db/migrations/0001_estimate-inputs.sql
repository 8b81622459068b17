CREATE TABLE `filament_price` (
	`material` text PRIMARY KEY NOT NULL,
	`price_per_kg_minor` integer NOT NULL,
	`updated_at` integer NOT NULL
);
--> statement-breakpoint
ALTER TABLE `lab_settings` ADD `plan_labour_hours` real DEFAULT 3 NOT NULL;--> statement-breakpoint
ALTER TABLE `printer` ADD `heat_up_minutes` real DEFAULT 6 NOT NULL;--> statement-breakpoint
ALTER TABLE `printer` ADD `changeover_minutes` real DEFAULT 15 NOT NULL;--> statement-breakpoint
ALTER TABLE `printer` ADD `handling_minutes_per_job` real DEFAULT 4 NOT NULL;