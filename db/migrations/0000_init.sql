CREATE TABLE `account` (
	`userId` text NOT NULL,
	`type` text NOT NULL,
	`provider` text NOT NULL,
	`providerAccountId` text NOT NULL,
	`refresh_token` text,
	`access_token` text,
	`expires_at` integer,
	`token_type` text,
	`scope` text,
	`id_token` text,
	`session_state` text,
	PRIMARY KEY(`provider`, `providerAccountId`),
	FOREIGN KEY (`userId`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE TABLE `campaign` (
	`id` text PRIMARY KEY NOT NULL,
	`slug` text NOT NULL,
	`proposal_id` text,
	`title` text NOT NULL,
	`summary` text NOT NULL,
	`state` text DEFAULT 'open' NOT NULL,
	`goal_minor` integer NOT NULL,
	`currency` text NOT NULL,
	`goal_override_reason` text,
	`deadline` integer NOT NULL,
	`opened_at` integer NOT NULL,
	`funded_at` integer,
	`closed_at` integer,
	`withdraw_reason` text,
	`host_id` text,
	`created_at` integer NOT NULL,
	FOREIGN KEY (`proposal_id`) REFERENCES `proposal`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`host_id`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE no action,
	CONSTRAINT "campaign_goal_positive" CHECK("campaign"."goal_minor" > 0)
);
--> statement-breakpoint
CREATE UNIQUE INDEX `campaign_slug_unique` ON `campaign` (`slug`);--> statement-breakpoint
CREATE INDEX `campaign_state_idx` ON `campaign` (`state`,`deadline`);--> statement-breakpoint
CREATE TABLE `job` (
	`id` text PRIMARY KEY NOT NULL,
	`campaign_id` text NOT NULL,
	`piece_id` text NOT NULL,
	`variant_id` text NOT NULL,
	`repeat` integer NOT NULL,
	`printer_id` text,
	`state` text DEFAULT 'planned' NOT NULL,
	`estimated_hours` real NOT NULL,
	`scheduled_start` integer,
	`actual_hours` real,
	`filament_used_grams` real,
	`notes` text,
	FOREIGN KEY (`campaign_id`) REFERENCES `campaign`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`piece_id`) REFERENCES `test_plan_piece`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`variant_id`) REFERENCES `test_plan_variant`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`printer_id`) REFERENCES `printer`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `job_identity_idx` ON `job` (`campaign_id`,`piece_id`,`variant_id`,`repeat`);--> statement-breakpoint
CREATE INDEX `job_printer_idx` ON `job` (`printer_id`,`state`);--> statement-breakpoint
CREATE TABLE `lab_settings` (
	`id` integer PRIMARY KEY NOT NULL,
	`lab_name` text NOT NULL,
	`currency` text NOT NULL,
	`time_zone` text NOT NULL,
	`labour_rate_minor_per_hour` integer NOT NULL,
	`fee_basis_points` integer NOT NULL,
	`fee_fixed_minor` integer NOT NULL,
	`contingency_percent` integer NOT NULL,
	`report_prep_hours` integer NOT NULL,
	`updated_at` integer NOT NULL,
	CONSTRAINT "lab_settings_single_row" CHECK("lab_settings"."id" = 1)
);
--> statement-breakpoint
CREATE TABLE `ledger_entry` (
	`id` text PRIMARY KEY NOT NULL,
	`kind` text NOT NULL,
	`amount_minor` integer NOT NULL,
	`currency` text NOT NULL,
	`campaign_id` text,
	`pledge_id` text,
	`membership_id` text,
	`external_ref` text NOT NULL,
	`memo` text,
	`occurred_at` integer NOT NULL,
	FOREIGN KEY (`campaign_id`) REFERENCES `campaign`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`pledge_id`) REFERENCES `pledge`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`membership_id`) REFERENCES `membership`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `ledger_entry_external_ref_unique` ON `ledger_entry` (`external_ref`);--> statement-breakpoint
CREATE INDEX `ledger_campaign_idx` ON `ledger_entry` (`campaign_id`);--> statement-breakpoint
CREATE INDEX `ledger_occurred_idx` ON `ledger_entry` (`occurred_at`);--> statement-breakpoint
CREATE TABLE `membership_plan` (
	`code` text PRIMARY KEY NOT NULL,
	`name` text NOT NULL,
	`monthly_minor` integer NOT NULL,
	`currency` text NOT NULL,
	`monthly_votes` integer NOT NULL,
	`early_blind_pairs` integer NOT NULL,
	`stripe_price_id` text,
	`position` integer NOT NULL
);
--> statement-breakpoint
CREATE TABLE `membership` (
	`id` text PRIMARY KEY NOT NULL,
	`user_id` text NOT NULL,
	`plan_code` text NOT NULL,
	`status` text NOT NULL,
	`subscription_id` text,
	`current_period_end` integer NOT NULL,
	`started_at` integer NOT NULL,
	`canceled_at` integer,
	FOREIGN KEY (`user_id`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`plan_code`) REFERENCES `membership_plan`(`code`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `membership_subscription_id_unique` ON `membership` (`subscription_id`);--> statement-breakpoint
CREATE INDEX `membership_user_idx` ON `membership` (`user_id`,`status`);--> statement-breakpoint
CREATE UNIQUE INDEX `membership_one_live_idx` ON `membership` (`user_id`) WHERE "membership"."status" in ('active', 'past_due');--> statement-breakpoint
CREATE TABLE `outbox` (
	`id` text PRIMARY KEY NOT NULL,
	`dedupe_key` text NOT NULL,
	`to_address` text NOT NULL,
	`template` text NOT NULL,
	`subject` text NOT NULL,
	`payload` text NOT NULL,
	`state` text DEFAULT 'queued' NOT NULL,
	`attempts` integer DEFAULT 0 NOT NULL,
	`next_attempt_at` integer NOT NULL,
	`last_error` text,
	`created_at` integer NOT NULL,
	`sent_at` integer
);
--> statement-breakpoint
CREATE UNIQUE INDEX `outbox_dedupe_key_unique` ON `outbox` (`dedupe_key`);--> statement-breakpoint
CREATE INDEX `outbox_due_idx` ON `outbox` (`state`,`next_attempt_at`);--> statement-breakpoint
CREATE TABLE `pledge` (
	`id` text PRIMARY KEY NOT NULL,
	`campaign_id` text NOT NULL,
	`supporter_id` text NOT NULL,
	`amount_minor` integer NOT NULL,
	`currency` text NOT NULL,
	`state` text DEFAULT 'pending' NOT NULL,
	`public_name` text,
	`checkout_session_id` text,
	`payment_intent_id` text,
	`refund_id` text,
	`created_at` integer NOT NULL,
	`paid_at` integer,
	`refunded_at` integer,
	FOREIGN KEY (`campaign_id`) REFERENCES `campaign`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`supporter_id`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE no action,
	CONSTRAINT "pledge_amount_positive" CHECK("pledge"."amount_minor" > 0)
);
--> statement-breakpoint
CREATE UNIQUE INDEX `pledge_checkout_session_id_unique` ON `pledge` (`checkout_session_id`);--> statement-breakpoint
CREATE UNIQUE INDEX `pledge_payment_intent_id_unique` ON `pledge` (`payment_intent_id`);--> statement-breakpoint
CREATE UNIQUE INDEX `pledge_refund_id_unique` ON `pledge` (`refund_id`);--> statement-breakpoint
CREATE INDEX `pledge_campaign_idx` ON `pledge` (`campaign_id`,`state`);--> statement-breakpoint
CREATE INDEX `pledge_supporter_idx` ON `pledge` (`supporter_id`);--> statement-breakpoint
CREATE TABLE `printer` (
	`id` text PRIMARY KEY NOT NULL,
	`slug` text NOT NULL,
	`name` text NOT NULL,
	`model` text NOT NULL,
	`motion_type` text NOT NULL,
	`build_x_mm` integer NOT NULL,
	`build_y_mm` integer NOT NULL,
	`build_z_mm` integer NOT NULL,
	`nozzle_mm` real NOT NULL,
	`max_flow_mm3_per_s` real NOT NULL,
	`efficiency` real NOT NULL,
	`enclosed` integer NOT NULL,
	`materials` text NOT NULL,
	`hourly_rate_minor` integer NOT NULL,
	`status` text DEFAULT 'available' NOT NULL,
	`created_at` integer NOT NULL
);
--> statement-breakpoint
CREATE UNIQUE INDEX `printer_slug_unique` ON `printer` (`slug`);--> statement-breakpoint
CREATE TABLE `proposal_vote` (
	`proposal_id` text NOT NULL,
	`user_id` text NOT NULL,
	`created_at` integer NOT NULL,
	PRIMARY KEY(`proposal_id`, `user_id`),
	FOREIGN KEY (`proposal_id`) REFERENCES `proposal`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`user_id`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE TABLE `proposal` (
	`id` text PRIMARY KEY NOT NULL,
	`slug` text NOT NULL,
	`title` text NOT NULL,
	`kind` text NOT NULL,
	`printer_type` text NOT NULL,
	`why` text NOT NULL,
	`description_md` text DEFAULT '' NOT NULL,
	`state` text DEFAULT 'draft' NOT NULL,
	`proposer_id` text NOT NULL,
	`merged_into_id` text,
	`decline_reason` text,
	`submitted_at` integer,
	`created_at` integer NOT NULL,
	`updated_at` integer NOT NULL,
	FOREIGN KEY (`proposer_id`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`merged_into_id`) REFERENCES `proposal`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `proposal_slug_unique` ON `proposal` (`slug`);--> statement-breakpoint
CREATE INDEX `proposal_state_idx` ON `proposal` (`state`,`created_at`);--> statement-breakpoint
CREATE INDEX `proposal_proposer_idx` ON `proposal` (`proposer_id`);--> statement-breakpoint
CREATE TABLE `report` (
	`id` text PRIMARY KEY NOT NULL,
	`campaign_id` text NOT NULL,
	`state` text DEFAULT 'draft' NOT NULL,
	`summary` text DEFAULT '' NOT NULL,
	`body_md` text DEFAULT '' NOT NULL,
	`video_url` text,
	`published_at` integer,
	`created_at` integer NOT NULL,
	`updated_at` integer NOT NULL,
	FOREIGN KEY (`campaign_id`) REFERENCES `campaign`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `report_campaign_id_unique` ON `report` (`campaign_id`);--> statement-breakpoint
CREATE TABLE `session` (
	`sessionToken` text PRIMARY KEY NOT NULL,
	`userId` text NOT NULL,
	`expires` integer NOT NULL,
	FOREIGN KEY (`userId`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE INDEX `session_user_idx` ON `session` (`userId`);--> statement-breakpoint
CREATE TABLE `test_plan_piece` (
	`id` text PRIMARY KEY NOT NULL,
	`test_plan_id` text NOT NULL,
	`name` text NOT NULL,
	`filament_grams` real NOT NULL,
	`position` integer NOT NULL,
	FOREIGN KEY (`test_plan_id`) REFERENCES `test_plan`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE TABLE `test_plan_variant` (
	`id` text PRIMARY KEY NOT NULL,
	`test_plan_id` text NOT NULL,
	`name` text NOT NULL,
	`is_reference` integer DEFAULT false NOT NULL,
	`position` integer NOT NULL,
	FOREIGN KEY (`test_plan_id`) REFERENCES `test_plan`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE TABLE `test_plan` (
	`id` text PRIMARY KEY NOT NULL,
	`campaign_id` text NOT NULL,
	`material` text NOT NULL,
	`layer_height_mm` real NOT NULL,
	`max_flow_mm3_per_s` real NOT NULL,
	`fan_percent` integer NOT NULL,
	`repeats` integer NOT NULL,
	`printer_id` text,
	`estimated_hours` real,
	`notes_md` text DEFAULT '' NOT NULL,
	FOREIGN KEY (`campaign_id`) REFERENCES `campaign`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`printer_id`) REFERENCES `printer`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `test_plan_campaign_id_unique` ON `test_plan` (`campaign_id`);--> statement-breakpoint
CREATE TABLE `upload` (
	`id` text PRIMARY KEY NOT NULL,
	`sha256` text NOT NULL,
	`kind` text NOT NULL,
	`mime_type` text NOT NULL,
	`size_bytes` integer NOT NULL,
	`original_name` text NOT NULL,
	`owner_id` text NOT NULL,
	`proposal_id` text,
	`created_at` integer NOT NULL,
	FOREIGN KEY (`owner_id`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`proposal_id`) REFERENCES `proposal`(`id`) ON UPDATE no action ON DELETE set null
);
--> statement-breakpoint
CREATE INDEX `upload_proposal_idx` ON `upload` (`proposal_id`);--> statement-breakpoint
CREATE UNIQUE INDEX `upload_owner_hash_idx` ON `upload` (`owner_id`,`sha256`);--> statement-breakpoint
CREATE TABLE `user` (
	`id` text PRIMARY KEY NOT NULL,
	`name` text,
	`email` text,
	`emailVerified` integer,
	`image` text,
	`role` text DEFAULT 'supporter' NOT NULL,
	`created_at` integer NOT NULL
);
--> statement-breakpoint
CREATE UNIQUE INDEX `user_email_unique` ON `user` (`email`);--> statement-breakpoint
CREATE TABLE `verificationToken` (
	`identifier` text NOT NULL,
	`token` text NOT NULL,
	`expires` integer NOT NULL,
	PRIMARY KEY(`identifier`, `token`)
);
