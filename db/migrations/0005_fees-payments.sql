CREATE TABLE `fee_payment_items` (
	`id` int unsigned AUTO_INCREMENT NOT NULL,
	`payment_id` int unsigned NOT NULL,
	`report_id` int unsigned NOT NULL,
	`active_report_id` int unsigned,
	`amount_cents` int unsigned NOT NULL,
	`currency` char(3) NOT NULL,
	`status` enum('pending','paid','released','refunded','unapplied') NOT NULL DEFAULT 'pending',
	`created_at` datetime(3) NOT NULL,
	`updated_at` datetime(3) NOT NULL,
	CONSTRAINT `fee_payment_items_id` PRIMARY KEY(`id`),
	CONSTRAINT `fee_payment_items_payment_report_uq` UNIQUE(`payment_id`,`report_id`),
	CONSTRAINT `fee_payment_items_active_report_uq` UNIQUE(`active_report_id`)
);
--> statement-breakpoint
CREATE TABLE `fee_payments` (
	`id` int unsigned AUTO_INCREMENT NOT NULL,
	`program_id` int unsigned NOT NULL,
	`payer_id` int unsigned NOT NULL,
	`company_id` int unsigned,
	`status` enum('pending','paid','canceled','expired','failed') NOT NULL DEFAULT 'pending',
	`amount_cents` int unsigned NOT NULL,
	`currency` char(3) NOT NULL,
	`refunded_cents` int unsigned NOT NULL DEFAULT 0,
	`checkout_session_id` varchar(255),
	`checkout_url` varchar(2048),
	`payment_intent_id` varchar(255),
	`paid_at` datetime(3),
	`closed_at` datetime(3),
	`failure_reason` varchar(300),
	`receipt_sent_at` datetime(3),
	`created_at` datetime(3) NOT NULL,
	`updated_at` datetime(3) NOT NULL,
	CONSTRAINT `fee_payments_id` PRIMARY KEY(`id`),
	CONSTRAINT `fee_payments_session_uq` UNIQUE(`checkout_session_id`)
);
--> statement-breakpoint
CREATE TABLE `fee_refunds` (
	`id` int unsigned AUTO_INCREMENT NOT NULL,
	`payment_id` int unsigned NOT NULL,
	`item_id` int unsigned NOT NULL,
	`report_id` int unsigned NOT NULL,
	`active_item_id` int unsigned,
	`amount_cents` int unsigned NOT NULL,
	`currency` char(3) NOT NULL,
	`status` enum('pending','succeeded','failed') NOT NULL DEFAULT 'pending',
	`reason` text NOT NULL,
	`requested_by` int unsigned,
	`provider_refund_id` varchar(255),
	`failure_reason` varchar(300),
	`succeeded_at` datetime(3),
	`created_at` datetime(3) NOT NULL,
	`updated_at` datetime(3) NOT NULL,
	CONSTRAINT `fee_refunds_id` PRIMARY KEY(`id`),
	CONSTRAINT `fee_refunds_provider_uq` UNIQUE(`provider_refund_id`),
	CONSTRAINT `fee_refunds_active_item_uq` UNIQUE(`active_item_id`)
);
--> statement-breakpoint
CREATE TABLE `fee_waivers` (
	`id` int unsigned AUTO_INCREMENT NOT NULL,
	`program_id` int unsigned NOT NULL,
	`report_id` int unsigned NOT NULL,
	`amount_cents` int unsigned NOT NULL,
	`currency` char(3) NOT NULL,
	`reason` text NOT NULL,
	`waived_by` int unsigned NOT NULL,
	`waived_at` datetime(3) NOT NULL,
	CONSTRAINT `fee_waivers_id` PRIMARY KEY(`id`),
	CONSTRAINT `fee_waivers_report_uq` UNIQUE(`report_id`)
);
--> statement-breakpoint
CREATE TABLE `payment_webhook_events` (
	`id` int unsigned AUTO_INCREMENT NOT NULL,
	`event_id` varchar(255) NOT NULL,
	`type` varchar(100) NOT NULL,
	`object_id` varchar(255) NOT NULL DEFAULT '',
	`outcome` varchar(40) NOT NULL,
	`detail` json,
	`received_at` datetime(3) NOT NULL,
	CONSTRAINT `payment_webhook_events_id` PRIMARY KEY(`id`),
	CONSTRAINT `payment_webhook_events_event_uq` UNIQUE(`event_id`)
);
--> statement-breakpoint
ALTER TABLE `fee_payment_items` ADD CONSTRAINT `fee_payment_items_payment_id_fee_payments_id_fk` FOREIGN KEY (`payment_id`) REFERENCES `fee_payments`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `fee_payment_items` ADD CONSTRAINT `fee_payment_items_report_id_test_reports_id_fk` FOREIGN KEY (`report_id`) REFERENCES `test_reports`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `fee_payments` ADD CONSTRAINT `fee_payments_program_id_programs_id_fk` FOREIGN KEY (`program_id`) REFERENCES `programs`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `fee_payments` ADD CONSTRAINT `fee_payments_payer_id_users_id_fk` FOREIGN KEY (`payer_id`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `fee_payments` ADD CONSTRAINT `fee_payments_company_id_companies_id_fk` FOREIGN KEY (`company_id`) REFERENCES `companies`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `fee_refunds` ADD CONSTRAINT `fee_refunds_payment_id_fee_payments_id_fk` FOREIGN KEY (`payment_id`) REFERENCES `fee_payments`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `fee_refunds` ADD CONSTRAINT `fee_refunds_item_id_fee_payment_items_id_fk` FOREIGN KEY (`item_id`) REFERENCES `fee_payment_items`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `fee_refunds` ADD CONSTRAINT `fee_refunds_report_id_test_reports_id_fk` FOREIGN KEY (`report_id`) REFERENCES `test_reports`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `fee_refunds` ADD CONSTRAINT `fee_refunds_requested_by_users_id_fk` FOREIGN KEY (`requested_by`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `fee_waivers` ADD CONSTRAINT `fee_waivers_program_id_programs_id_fk` FOREIGN KEY (`program_id`) REFERENCES `programs`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `fee_waivers` ADD CONSTRAINT `fee_waivers_report_id_test_reports_id_fk` FOREIGN KEY (`report_id`) REFERENCES `test_reports`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `fee_waivers` ADD CONSTRAINT `fee_waivers_waived_by_users_id_fk` FOREIGN KEY (`waived_by`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX `fee_payment_items_report_idx` ON `fee_payment_items` (`report_id`);--> statement-breakpoint
CREATE INDEX `fee_payments_payer_idx` ON `fee_payments` (`payer_id`,`created_at`);--> statement-breakpoint
CREATE INDEX `fee_payments_company_idx` ON `fee_payments` (`company_id`,`paid_at`);--> statement-breakpoint
CREATE INDEX `fee_payments_program_idx` ON `fee_payments` (`program_id`,`status`,`paid_at`);--> statement-breakpoint
CREATE INDEX `fee_payments_intent_idx` ON `fee_payments` (`payment_intent_id`);--> statement-breakpoint
CREATE INDEX `fee_refunds_payment_idx` ON `fee_refunds` (`payment_id`);--> statement-breakpoint
CREATE INDEX `fee_refunds_report_idx` ON `fee_refunds` (`report_id`);--> statement-breakpoint
CREATE INDEX `fee_waivers_program_idx` ON `fee_waivers` (`program_id`,`waived_at`);--> statement-breakpoint
CREATE INDEX `payment_webhook_events_object_idx` ON `payment_webhook_events` (`object_id`);