CREATE TABLE `blind_pair_vote` (
	`id` text PRIMARY KEY NOT NULL,
	`campaign_id` text NOT NULL,
	`piece_id` text NOT NULL,
	`pair_key` text NOT NULL,
	`photo_a_id` text NOT NULL,
	`photo_b_id` text NOT NULL,
	`winner_photo_id` text,
	`user_id` text NOT NULL,
	`ticket_nonce` text NOT NULL,
	`shown_at` integer NOT NULL,
	`created_at` integer NOT NULL,
	FOREIGN KEY (`campaign_id`) REFERENCES `campaign`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`piece_id`) REFERENCES `test_plan_piece`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`photo_a_id`) REFERENCES `report_photo`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`photo_b_id`) REFERENCES `report_photo`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`user_id`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE cascade,
	CONSTRAINT "blind_pair_vote_order" CHECK("blind_pair_vote"."photo_a_id" < "blind_pair_vote"."photo_b_id"),
	CONSTRAINT "blind_pair_vote_winner" CHECK("blind_pair_vote"."winner_photo_id" is null or "blind_pair_vote"."winner_photo_id" in ("blind_pair_vote"."photo_a_id", "blind_pair_vote"."photo_b_id"))
);
--> statement-breakpoint
CREATE UNIQUE INDEX `blind_pair_vote_ticket_nonce_unique` ON `blind_pair_vote` (`ticket_nonce`);--> statement-breakpoint
CREATE UNIQUE INDEX `blind_pair_vote_user_pair_idx` ON `blind_pair_vote` (`user_id`,`pair_key`);--> statement-breakpoint
CREATE INDEX `blind_pair_vote_campaign_idx` ON `blind_pair_vote` (`campaign_id`,`pair_key`);