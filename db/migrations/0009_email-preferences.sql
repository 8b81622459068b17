CREATE TABLE `email_preference` (
	`user_id` text NOT NULL,
	`category` text NOT NULL,
	`enabled` integer NOT NULL,
	`changed_via` text NOT NULL,
	`updated_at` integer NOT NULL,
	PRIMARY KEY(`user_id`, `category`),
	FOREIGN KEY (`user_id`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
ALTER TABLE `outbox` ADD `user_id` text;--> statement-breakpoint
ALTER TABLE `outbox` ADD `category` text DEFAULT 'account' NOT NULL;--> statement-breakpoint
ALTER TABLE `outbox` ADD `claim_token` text;--> statement-breakpoint
ALTER TABLE `outbox` ADD `interrupted_attempts` integer DEFAULT 0 NOT NULL;--> statement-breakpoint
ALTER TABLE `outbox` ADD `finished_at` integer;