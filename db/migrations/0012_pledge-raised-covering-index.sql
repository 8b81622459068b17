DROP INDEX `pledge_campaign_idx`;--> statement-breakpoint
CREATE INDEX `pledge_campaign_idx` ON `pledge` (`campaign_id`,`state`,`amount_minor`);