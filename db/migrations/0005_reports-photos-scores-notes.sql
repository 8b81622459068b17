CREATE TABLE `lab_note` (
	`id` text PRIMARY KEY NOT NULL,
	`campaign_id` text NOT NULL,
	`author_id` text NOT NULL,
	`body_md` text NOT NULL,
	`created_at` integer NOT NULL,
	`published_at` integer,
	FOREIGN KEY (`campaign_id`) REFERENCES `campaign`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`author_id`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `lab_note_campaign_idx` ON `lab_note` (`campaign_id`,`published_at`);--> statement-breakpoint
CREATE TABLE `report_photo` (
	`id` text PRIMARY KEY NOT NULL,
	`report_id` text NOT NULL,
	`piece_id` text NOT NULL,
	`variant_id` text NOT NULL,
	`upload_id` text NOT NULL,
	`caption` text DEFAULT '' NOT NULL,
	`position` integer DEFAULT 0 NOT NULL,
	`light_set_key` text,
	`created_at` integer NOT NULL,
	FOREIGN KEY (`report_id`) REFERENCES `report`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`piece_id`) REFERENCES `test_plan_piece`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`variant_id`) REFERENCES `test_plan_variant`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`upload_id`) REFERENCES `upload`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `report_photo_slot_idx` ON `report_photo` (`report_id`,`piece_id`,`variant_id`,`position`);--> statement-breakpoint
CREATE UNIQUE INDEX `report_photo_upload_idx` ON `report_photo` (`report_id`,`piece_id`,`variant_id`,`upload_id`);--> statement-breakpoint
CREATE TABLE `report_score` (
	`id` text PRIMARY KEY NOT NULL,
	`report_id` text NOT NULL,
	`piece_id` text,
	`variant_id` text NOT NULL,
	`criterion` text NOT NULL,
	`score` integer NOT NULL,
	`note` text DEFAULT '' NOT NULL,
	FOREIGN KEY (`report_id`) REFERENCES `report`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`piece_id`) REFERENCES `test_plan_piece`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`variant_id`) REFERENCES `test_plan_variant`(`id`) ON UPDATE no action ON DELETE cascade,
	CONSTRAINT "report_score_range" CHECK("report_score"."score" between -2 and 2)
);
--> statement-breakpoint
CREATE UNIQUE INDEX `report_score_run_cell_idx` ON `report_score` (`report_id`,`variant_id`,`criterion`) WHERE "report_score"."piece_id" is null;--> statement-breakpoint
CREATE UNIQUE INDEX `report_score_piece_cell_idx` ON `report_score` (`report_id`,`piece_id`,`variant_id`,`criterion`) WHERE "report_score"."piece_id" is not null;--> statement-breakpoint
ALTER TABLE `report` ADD `actual_cost_minor` integer;--> statement-breakpoint
ALTER TABLE `report` ADD `actual_cost_source` text;--> statement-breakpoint
ALTER TABLE `report` ADD `author_id` text REFERENCES user(id);