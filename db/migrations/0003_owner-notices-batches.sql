ALTER TABLE `program_settings` ADD `discontinue_days_after_final` smallint DEFAULT 15 NOT NULL;--> statement-breakpoint
ALTER TABLE `notice_runs` ADD `letters_storage_key` varchar(100);--> statement-breakpoint
ALTER TABLE `notices` ADD `batch_key` varchar(64);--> statement-breakpoint
CREATE INDEX `notices_batch_idx` ON `notices` (`batch_key`);