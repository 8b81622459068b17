CREATE TABLE `billing_customer` (
	`user_id` text PRIMARY KEY NOT NULL,
	`customer_id` text NOT NULL,
	`created_at` integer NOT NULL,
	FOREIGN KEY (`user_id`) REFERENCES `user`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE UNIQUE INDEX `billing_customer_customer_id_unique` ON `billing_customer` (`customer_id`);--> statement-breakpoint
ALTER TABLE `membership` ADD `cancel_at_period_end` integer DEFAULT false NOT NULL;--> statement-breakpoint
ALTER TABLE `membership` ADD `cancel_flag_at` integer;--> statement-breakpoint
ALTER TABLE `membership` ADD `unpaid_period_end` integer;--> statement-breakpoint
ALTER TABLE `membership` ADD `ended_at` integer;