CREATE TABLE `refund_request` (
	`pledge_id` text PRIMARY KEY NOT NULL,
	`campaign_id` text NOT NULL,
	`reason` text NOT NULL,
	`state` text DEFAULT 'requested' NOT NULL,
	`refund_id` text,
	`attempts` integer DEFAULT 0 NOT NULL,
	`last_error` text,
	`lease_until` integer NOT NULL,
	`requested_at` integer NOT NULL,
	`completed_at` integer,
	FOREIGN KEY (`pledge_id`) REFERENCES `pledge`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`campaign_id`) REFERENCES `campaign`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `refund_request_due_idx` ON `refund_request` (`state`,`lease_until`);--> statement-breakpoint
CREATE INDEX `refund_request_campaign_idx` ON `refund_request` (`campaign_id`,`state`);