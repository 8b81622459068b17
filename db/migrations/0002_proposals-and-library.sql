CREATE TABLE `proposal_follower` (
	`proposal_id` text NOT NULL,
	`user_id` text NOT NULL,
	`created_at` integer NOT NULL,
	PRIMARY KEY(`proposal_id`, `user_id`),
	FOREIGN KEY (`proposal_id`) REFERENCES `proposal`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`user_id`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE TABLE `test_piece` (
	`id` text PRIMARY KEY NOT NULL,
	`slug` text NOT NULL,
	`name` text NOT NULL,
	`description` text DEFAULT '' NOT NULL,
	`filament_grams` real NOT NULL,
	`mesh_upload_id` text,
	`active` integer DEFAULT true NOT NULL,
	`position` integer DEFAULT 0 NOT NULL,
	`created_at` integer NOT NULL,
	FOREIGN KEY (`mesh_upload_id`) REFERENCES `upload`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE UNIQUE INDEX `test_piece_slug_unique` ON `test_piece` (`slug`);--> statement-breakpoint
ALTER TABLE `lab_settings` ADD `require_safety_note` integer DEFAULT true NOT NULL;--> statement-breakpoint
ALTER TABLE `proposal` ADD `material` text;--> statement-breakpoint
ALTER TABLE `proposal` ADD `duct_details` text;--> statement-breakpoint
ALTER TABLE `proposal` ADD `safety_note` text;--> statement-breakpoint
ALTER TABLE `proposal` ADD `vote_count` integer DEFAULT 0 NOT NULL;--> statement-breakpoint
ALTER TABLE `proposal` ADD `review_started_at` integer;--> statement-breakpoint
ALTER TABLE `proposal` ADD `decided_at` integer;--> statement-breakpoint
CREATE INDEX `proposal_votes_idx` ON `proposal` (`state`,`vote_count`);--> statement-breakpoint
ALTER TABLE `test_plan_piece` ADD `library_piece_id` text REFERENCES test_piece(id);--> statement-breakpoint
ALTER TABLE `upload` ADD `thumbnail_sha256` text;--> statement-breakpoint
ALTER TABLE `upload` ADD `width_px` integer;--> statement-breakpoint
ALTER TABLE `upload` ADD `height_px` integer;--> statement-breakpoint
ALTER TABLE `upload` ADD `analysis` text;--> statement-breakpoint
CREATE INDEX `proposal_vote_user_idx` ON `proposal_vote` (`user_id`,`created_at`);