CREATE TABLE `local_rule_sets` (
	`id` int unsigned AUTO_INCREMENT NOT NULL,
	`program_id` int unsigned NOT NULL,
	`edition` varchar(60) NOT NULL,
	`label` varchar(160) NOT NULL,
	`data` json NOT NULL,
	`adopted_on` date NOT NULL,
	`created_at` datetime(3) NOT NULL,
	CONSTRAINT `local_rule_sets_id` PRIMARY KEY(`id`),
	CONSTRAINT `local_rule_sets_edition_uq` UNIQUE(`program_id`,`edition`)
);
--> statement-breakpoint
CREATE TABLE `program_settings` (
	`program_id` int unsigned NOT NULL,
	`test_interval_months` smallint NOT NULL DEFAULT 12,
	`due_model` enum('anniversary','window') NOT NULL DEFAULT 'anniversary',
	`window_start` char(5) NOT NULL DEFAULT '01-01',
	`window_end` char(5) NOT NULL DEFAULT '05-31',
	`due_soon_days` smallint NOT NULL DEFAULT 30,
	`repair_days_severe` smallint NOT NULL DEFAULT 14,
	`repair_days_high` smallint NOT NULL DEFAULT 14,
	`repair_days_low` smallint NOT NULL DEFAULT 30,
	`report_deadline_days` smallint NOT NULL DEFAULT 10,
	`reminder_days_before` smallint NOT NULL DEFAULT 30,
	`overdue_days_after` smallint NOT NULL DEFAULT 1,
	`final_days_after` smallint NOT NULL DEFAULT 30,
	`repair_reminder_days_before` smallint NOT NULL DEFAULT 7,
	`filing_fee_cents` int unsigned NOT NULL DEFAULT 0,
	`currency` char(3) NOT NULL DEFAULT 'USD',
	`units` enum('psid','kPa') NOT NULL DEFAULT 'psid',
	`rule_set_edition` varchar(60) NOT NULL,
	`kit_policy` enum('refuse','flag') NOT NULL DEFAULT 'refuse',
	`updated_at` datetime(3) NOT NULL,
	`updated_by` int unsigned,
	CONSTRAINT `program_settings_program_id` PRIMARY KEY(`program_id`)
);
--> statement-breakpoint
CREATE TABLE `programs` (
	`id` int unsigned AUTO_INCREMENT NOT NULL,
	`slug` varchar(40) NOT NULL,
	`name` varchar(160) NOT NULL,
	`short_name` varchar(40) NOT NULL,
	`report_prefix` varchar(6) NOT NULL,
	`timezone` varchar(64) NOT NULL DEFAULT 'UTC',
	`contact_email` varchar(254) NOT NULL,
	`reply_to_email` varchar(254) NOT NULL,
	`phone` varchar(40) NOT NULL DEFAULT '',
	`mailing_address` varchar(300) NOT NULL DEFAULT '',
	`created_at` datetime(3) NOT NULL,
	CONSTRAINT `programs_id` PRIMARY KEY(`id`),
	CONSTRAINT `programs_slug_uq` UNIQUE(`slug`),
	CONSTRAINT `programs_prefix_uq` UNIQUE(`report_prefix`)
);
--> statement-breakpoint
CREATE TABLE `return_reasons` (
	`id` int unsigned AUTO_INCREMENT NOT NULL,
	`program_id` int unsigned NOT NULL,
	`label` varchar(200) NOT NULL,
	`guidance` text,
	`is_active` boolean NOT NULL DEFAULT true,
	`sort_order` smallint NOT NULL DEFAULT 0,
	CONSTRAINT `return_reasons_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `auth_tokens` (
	`id` int unsigned AUTO_INCREMENT NOT NULL,
	`token_hash` varchar(64) NOT NULL,
	`user_id` int unsigned NOT NULL,
	`purpose` enum('password_reset','invitation','owner_link','owner_code') NOT NULL,
	`expires_at` datetime(3) NOT NULL,
	`used_at` datetime(3),
	`created_at` datetime(3) NOT NULL,
	CONSTRAINT `auth_tokens_id` PRIMARY KEY(`id`),
	CONSTRAINT `auth_tokens_hash_uq` UNIQUE(`token_hash`)
);
--> statement-breakpoint
CREATE TABLE `companies` (
	`id` int unsigned AUTO_INCREMENT NOT NULL,
	`name` varchar(160) NOT NULL,
	`phone` varchar(40) NOT NULL DEFAULT '',
	`email` varchar(254) NOT NULL DEFAULT '',
	`address` varchar(300) NOT NULL DEFAULT '',
	`created_at` datetime(3) NOT NULL,
	CONSTRAINT `companies_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `sessions` (
	`id` varchar(64) NOT NULL,
	`user_id` int unsigned NOT NULL,
	`expires_at` datetime NOT NULL,
	CONSTRAINT `sessions_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `sign_in_throttle` (
	`key` varchar(300) NOT NULL,
	`failures` smallint unsigned NOT NULL DEFAULT 0,
	`window_started_at` datetime(3) NOT NULL,
	`locked_until` datetime(3),
	CONSTRAINT `sign_in_throttle_key` PRIMARY KEY(`key`)
);
--> statement-breakpoint
CREATE TABLE `tester_approvals` (
	`id` int unsigned AUTO_INCREMENT NOT NULL,
	`program_id` int unsigned NOT NULL,
	`tester_id` int unsigned NOT NULL,
	`status` enum('pending','approved','rejected','suspended') NOT NULL DEFAULT 'pending',
	`reason` text,
	`decided_by` int unsigned,
	`decided_at` datetime(3),
	`created_at` datetime(3) NOT NULL,
	CONSTRAINT `tester_approvals_id` PRIMARY KEY(`id`),
	CONSTRAINT `tester_approvals_uq` UNIQUE(`program_id`,`tester_id`)
);
--> statement-breakpoint
CREATE TABLE `users` (
	`id` int unsigned AUTO_INCREMENT NOT NULL,
	`email` varchar(254) NOT NULL,
	`name` varchar(120) NOT NULL,
	`phone` varchar(40) NOT NULL DEFAULT '',
	`password_hash` varchar(255),
	`role` enum('tester','inspector','admin','owner') NOT NULL,
	`program_id` int unsigned,
	`status` enum('active','invited','suspended','disabled') NOT NULL DEFAULT 'active',
	`company_id` int unsigned,
	`is_billing_manager` boolean NOT NULL DEFAULT false,
	`password_changed_at` datetime(3),
	`last_sign_in_at` datetime(3),
	`created_at` datetime(3) NOT NULL,
	`updated_at` datetime(3) NOT NULL,
	CONSTRAINT `users_id` PRIMARY KEY(`id`),
	CONSTRAINT `users_email_uq` UNIQUE(`email`)
);
--> statement-breakpoint
CREATE TABLE `attachments` (
	`id` int unsigned AUTO_INCREMENT NOT NULL,
	`uploaded_by` int unsigned NOT NULL,
	`purpose` enum('certification','kit_verification','inventory_import','import_errors','other') NOT NULL,
	`original_name` varchar(255) NOT NULL,
	`content_type` varchar(100) NOT NULL,
	`size_bytes` int unsigned NOT NULL,
	`sha256` varchar(64) NOT NULL,
	`storage_key` varchar(100) NOT NULL,
	`created_at` datetime(3) NOT NULL,
	CONSTRAINT `attachments_id` PRIMARY KEY(`id`),
	CONSTRAINT `attachments_storage_key_uq` UNIQUE(`storage_key`)
);
--> statement-breakpoint
CREATE TABLE `certifications` (
	`id` int unsigned AUTO_INCREMENT NOT NULL,
	`tester_id` int unsigned NOT NULL,
	`certifying_body` varchar(160) NOT NULL,
	`number` varchar(60) NOT NULL,
	`issued_on` date,
	`expires_on` date NOT NULL,
	`attachment_id` int unsigned,
	`created_at` datetime(3) NOT NULL,
	`updated_at` datetime(3) NOT NULL,
	CONSTRAINT `certifications_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `test_kits` (
	`id` int unsigned AUTO_INCREMENT NOT NULL,
	`tester_id` int unsigned NOT NULL,
	`make` varchar(80) NOT NULL,
	`model` varchar(80) NOT NULL,
	`serial` varchar(60) NOT NULL,
	`last_verified_on` date NOT NULL,
	`verification_result` enum('passed','adjusted','failed') NOT NULL DEFAULT 'passed',
	`verified_by` varchar(160) NOT NULL DEFAULT '',
	`attachment_id` int unsigned,
	`retired_at` datetime(3),
	`created_at` datetime(3) NOT NULL,
	`updated_at` datetime(3) NOT NULL,
	CONSTRAINT `test_kits_id` PRIMARY KEY(`id`),
	CONSTRAINT `test_kits_serial_uq` UNIQUE(`tester_id`,`serial`)
);
--> statement-breakpoint
CREATE TABLE `assemblies` (
	`id` int unsigned AUTO_INCREMENT NOT NULL,
	`program_id` int unsigned NOT NULL,
	`site_id` int unsigned NOT NULL,
	`kind` enum('RP','RPDA','DC','DCDA','PVB','SVB','AG') NOT NULL,
	`make` varchar(80) NOT NULL DEFAULT '',
	`model` varchar(80) NOT NULL DEFAULT '',
	`size` varchar(20) NOT NULL DEFAULT '',
	`serial` varchar(60) NOT NULL DEFAULT '',
	`location` varchar(200) NOT NULL DEFAULT '',
	`hazard` enum('severe','high','low') NOT NULL DEFAULT 'low',
	`backpressure_possible` boolean NOT NULL DEFAULT false,
	`installed_on` date,
	`status` enum('active','awaiting_confirmation','removed','replaced') NOT NULL DEFAULT 'active',
	`removed_on` date,
	`replaced_by_id` int unsigned,
	`registered_by` int unsigned,
	`notes` text,
	`base_state` enum('active','failed','inactive') NOT NULL DEFAULT 'active',
	`last_tested_on` date,
	`last_outcome` enum('pass','fail'),
	`last_passed_on` date,
	`next_due_on` date,
	`repair_due_on` date,
	`notice_stage` enum('reminder','overdue','final'),
	`notice_cycle` date,
	`created_at` datetime(3) NOT NULL,
	`updated_at` datetime(3) NOT NULL,
	CONSTRAINT `assemblies_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `owners` (
	`id` int unsigned AUTO_INCREMENT NOT NULL,
	`program_id` int unsigned NOT NULL,
	`name` varchar(160) NOT NULL,
	`email` varchar(254),
	`phone` varchar(40) NOT NULL DEFAULT '',
	`mailing_address` varchar(300) NOT NULL DEFAULT '',
	`user_id` int unsigned,
	`created_at` datetime(3) NOT NULL,
	`updated_at` datetime(3) NOT NULL,
	CONSTRAINT `owners_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `site_owners` (
	`site_id` int unsigned NOT NULL,
	`owner_id` int unsigned NOT NULL,
	`relation` enum('owner','manager') NOT NULL DEFAULT 'owner',
	`receives_notices` boolean NOT NULL DEFAULT true,
	CONSTRAINT `site_owners_site_id_owner_id_pk` PRIMARY KEY(`site_id`,`owner_id`)
);
--> statement-breakpoint
CREATE TABLE `sites` (
	`id` int unsigned AUTO_INCREMENT NOT NULL,
	`program_id` int unsigned NOT NULL,
	`account_number` varchar(40) NOT NULL,
	`name` varchar(160) NOT NULL,
	`address_line1` varchar(200) NOT NULL,
	`address_line2` varchar(200) NOT NULL DEFAULT '',
	`city` varchar(100) NOT NULL,
	`postal_code` varchar(20) NOT NULL DEFAULT '',
	`hazard` enum('severe','high','low') NOT NULL DEFAULT 'low',
	`facility_type` varchar(60) NOT NULL DEFAULT '',
	`contact_name` varchar(120) NOT NULL DEFAULT '',
	`contact_phone` varchar(40) NOT NULL DEFAULT '',
	`notes` text,
	`is_active` boolean NOT NULL DEFAULT true,
	`created_at` datetime(3) NOT NULL,
	`updated_at` datetime(3) NOT NULL,
	CONSTRAINT `sites_id` PRIMARY KEY(`id`),
	CONSTRAINT `sites_account_uq` UNIQUE(`program_id`,`account_number`)
);
--> statement-breakpoint
CREATE TABLE `certificates` (
	`id` int unsigned AUTO_INCREMENT NOT NULL,
	`report_id` int unsigned NOT NULL,
	`code` varchar(32) NOT NULL,
	`issued_at` datetime(3) NOT NULL,
	`issued_by` int unsigned,
	`superseded_at` datetime(3),
	CONSTRAINT `certificates_id` PRIMARY KEY(`id`),
	CONSTRAINT `certificates_code_uq` UNIQUE(`code`)
);
--> statement-breakpoint
CREATE TABLE `report_drafts` (
	`id` int unsigned AUTO_INCREMENT NOT NULL,
	`tester_id` int unsigned NOT NULL,
	`client_key` varchar(64) NOT NULL,
	`program_id` int unsigned,
	`assembly_id` int unsigned,
	`based_on_report_id` int unsigned,
	`data` json NOT NULL,
	`client_revision` int unsigned NOT NULL DEFAULT 0,
	`created_at` datetime(3) NOT NULL,
	`updated_at` datetime(3) NOT NULL,
	CONSTRAINT `report_drafts_id` PRIMARY KEY(`id`),
	CONSTRAINT `report_drafts_key_uq` UNIQUE(`tester_id`,`client_key`)
);
--> statement-breakpoint
CREATE TABLE `report_readings` (
	`report_id` int unsigned NOT NULL,
	`phase` enum('initial','retest') NOT NULL,
	`relief_opening` decimal(6,1),
	`relief_did_not_open` boolean,
	`check1` decimal(6,1),
	`check1_tight` boolean,
	`check2` decimal(6,1),
	`check2_tight` boolean,
	`shutoff2_tight` boolean,
	`air_inlet_opening` decimal(6,1),
	`air_inlet_did_not_open` boolean,
	`air_inlet_fully_open` boolean,
	`check_differential` decimal(6,1),
	`check_tight` boolean,
	`air_gap_inches` decimal(6,2),
	`pipe_diameter_inches` decimal(6,2),
	`near_side_wall` boolean,
	`outcome` enum('pass','fail','incomplete') NOT NULL,
	CONSTRAINT `report_readings_report_id_phase_pk` PRIMARY KEY(`report_id`,`phase`)
);
--> statement-breakpoint
CREATE TABLE `report_repairs` (
	`id` int unsigned AUTO_INCREMENT NOT NULL,
	`report_id` int unsigned NOT NULL,
	`component` enum('check1','check2','relief_valve','air_inlet','check','shutoff1','shutoff2','other') NOT NULL,
	`part` enum('disc_rubber','spring','seat','seat_o_ring','cover_o_ring','diaphragm','relief_disc','guide','other') NOT NULL,
	`action` enum('cleaned','replaced') NOT NULL,
	`note` varchar(300) NOT NULL DEFAULT '',
	CONSTRAINT `report_repairs_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `reviews` (
	`id` int unsigned AUTO_INCREMENT NOT NULL,
	`report_id` int unsigned NOT NULL,
	`inspector_id` int unsigned NOT NULL,
	`decision` enum('accepted','returned') NOT NULL,
	`reasons` json NOT NULL,
	`note` text,
	`decided_at` datetime(3) NOT NULL,
	CONSTRAINT `reviews_id` PRIMARY KEY(`id`),
	CONSTRAINT `reviews_report_uq` UNIQUE(`report_id`)
);
--> statement-breakpoint
CREATE TABLE `test_reports` (
	`id` int unsigned AUTO_INCREMENT NOT NULL,
	`program_id` int unsigned NOT NULL,
	`report_number` varchar(24) NOT NULL,
	`revision` smallint unsigned NOT NULL DEFAULT 1,
	`supersedes_id` int unsigned,
	`amends_id` int unsigned,
	`assembly_id` int unsigned NOT NULL,
	`tester_id` int unsigned NOT NULL,
	`kit_id` int unsigned,
	`certification_id` int unsigned,
	`status` enum('awaiting_fee','queued','accepted','returned','superseded') NOT NULL,
	`tested_at` datetime NOT NULL,
	`tested_on` date NOT NULL,
	`reason` enum('annual','installation','repair','relocation','incident','other') NOT NULL,
	`reason_note` varchar(300) NOT NULL DEFAULT '',
	`installation` enum('existing','new','replacement') NOT NULL DEFAULT 'existing',
	`previous_serial` varchar(60) NOT NULL DEFAULT '',
	`orientation_approved` boolean,
	`relief_port_air_gap_ok` boolean,
	`line_pressure_psi` decimal(5,1),
	`unit` enum('psid','kPa') NOT NULL DEFAULT 'psid',
	`rule_set_edition` varchar(60) NOT NULL,
	`remarks` text,
	`assembly_snapshot` json NOT NULL,
	`tester_snapshot` json NOT NULL,
	`kit_snapshot` json,
	`initial_outcome` enum('pass','fail','incomplete') NOT NULL,
	`final_outcome` enum('pass','fail') NOT NULL,
	`was_repaired` boolean NOT NULL DEFAULT false,
	`grade` json NOT NULL,
	`validity` json NOT NULL,
	`signals` json NOT NULL,
	`warning_count` smallint unsigned NOT NULL DEFAULT 0,
	`is_clean` boolean NOT NULL DEFAULT false,
	`fingerprint` varchar(120) NOT NULL,
	`attested_name` varchar(120) NOT NULL,
	`attested_at` datetime(3) NOT NULL,
	`submitted_at` datetime(3) NOT NULL,
	`idempotency_key` varchar(64) NOT NULL,
	`fee_cents` int unsigned NOT NULL DEFAULT 0,
	`fee_currency` varchar(3) NOT NULL DEFAULT 'USD',
	`fee_status` enum('none','owed','paid','waived','refunded') NOT NULL DEFAULT 'none',
	`decided_at` datetime(3),
	`decided_by` int unsigned,
	`verification_code` varchar(32) NOT NULL,
	`created_at` datetime(3) NOT NULL,
	`updated_at` datetime(3) NOT NULL,
	CONSTRAINT `test_reports_id` PRIMARY KEY(`id`),
	CONSTRAINT `test_reports_number_uq` UNIQUE(`report_number`,`revision`),
	CONSTRAINT `test_reports_idempotency_uq` UNIQUE(`tester_id`,`idempotency_key`),
	CONSTRAINT `test_reports_verification_uq` UNIQUE(`verification_code`)
);
--> statement-breakpoint
CREATE TABLE `job_leases` (
	`name` varchar(100) NOT NULL,
	`holder` varchar(100) NOT NULL,
	`expires_at` datetime(3) NOT NULL,
	CONSTRAINT `job_leases_name` PRIMARY KEY(`name`)
);
--> statement-breakpoint
CREATE TABLE `notice_runs` (
	`id` int unsigned AUTO_INCREMENT NOT NULL,
	`program_id` int unsigned NOT NULL,
	`run_on` date NOT NULL,
	`started_by` int unsigned,
	`trigger` enum('schedule','button') NOT NULL,
	`status` enum('running','finished','failed','skipped') NOT NULL,
	`planned` int unsigned NOT NULL DEFAULT 0,
	`sent` int unsigned NOT NULL DEFAULT 0,
	`failed` int unsigned NOT NULL DEFAULT 0,
	`letters` int unsigned NOT NULL DEFAULT 0,
	`total` int unsigned NOT NULL DEFAULT 0,
	`log` text,
	`started_at` datetime(3) NOT NULL,
	`finished_at` datetime(3),
	CONSTRAINT `notice_runs_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `notices` (
	`id` int unsigned AUTO_INCREMENT NOT NULL,
	`program_id` int unsigned NOT NULL,
	`assembly_id` int unsigned NOT NULL,
	`kind` enum('reminder','overdue','final','repair_reminder') NOT NULL,
	`due_cycle` date NOT NULL,
	`notice_key` varchar(120) NOT NULL,
	`owner_id` int unsigned,
	`channel` enum('email','letter') NOT NULL,
	`recipient_email` varchar(254),
	`status` enum('pending','sent','failed','letter_ready','letter_printed') NOT NULL DEFAULT 'pending',
	`attempts` smallint unsigned NOT NULL DEFAULT 0,
	`next_attempt_at` datetime(3),
	`last_error` text,
	`message_id` varchar(120),
	`planned_on` date NOT NULL,
	`sent_at` datetime(3),
	`run_id` int unsigned,
	`created_at` datetime(3) NOT NULL,
	CONSTRAINT `notices_id` PRIMARY KEY(`id`),
	CONSTRAINT `notices_key_uq` UNIQUE(`notice_key`)
);
--> statement-breakpoint
CREATE TABLE `audit_log` (
	`id` bigint unsigned AUTO_INCREMENT NOT NULL,
	`program_id` int unsigned,
	`actor_id` int unsigned,
	`action` varchar(80) NOT NULL,
	`entity_type` varchar(40) NOT NULL,
	`entity_id` varchar(40) NOT NULL,
	`before` json,
	`after` json,
	`at` datetime(3) NOT NULL,
	CONSTRAINT `audit_log_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
CREATE TABLE `import_jobs` (
	`id` int unsigned AUTO_INCREMENT NOT NULL,
	`program_id` int unsigned NOT NULL,
	`created_by` int unsigned NOT NULL,
	`file_id` int unsigned NOT NULL,
	`error_file_id` int unsigned,
	`mapping` json NOT NULL,
	`status` enum('running','finished','failed') NOT NULL,
	`total_rows` int unsigned NOT NULL DEFAULT 0,
	`processed_rows` int unsigned NOT NULL DEFAULT 0,
	`inserted_rows` int unsigned NOT NULL DEFAULT 0,
	`updated_rows` int unsigned NOT NULL DEFAULT 0,
	`unchanged_rows` int unsigned NOT NULL DEFAULT 0,
	`failed_rows` int unsigned NOT NULL DEFAULT 0,
	`message` text,
	`started_at` datetime(3) NOT NULL,
	`finished_at` datetime(3),
	CONSTRAINT `import_jobs_id` PRIMARY KEY(`id`)
);
--> statement-breakpoint
ALTER TABLE `local_rule_sets` ADD CONSTRAINT `local_rule_sets_program_id_programs_id_fk` FOREIGN KEY (`program_id`) REFERENCES `programs`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `program_settings` ADD CONSTRAINT `program_settings_program_id_programs_id_fk` FOREIGN KEY (`program_id`) REFERENCES `programs`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `return_reasons` ADD CONSTRAINT `return_reasons_program_id_programs_id_fk` FOREIGN KEY (`program_id`) REFERENCES `programs`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `auth_tokens` ADD CONSTRAINT `auth_tokens_user_id_users_id_fk` FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `sessions` ADD CONSTRAINT `sessions_user_id_users_id_fk` FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `tester_approvals` ADD CONSTRAINT `tester_approvals_program_id_programs_id_fk` FOREIGN KEY (`program_id`) REFERENCES `programs`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `tester_approvals` ADD CONSTRAINT `tester_approvals_tester_id_users_id_fk` FOREIGN KEY (`tester_id`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `tester_approvals` ADD CONSTRAINT `tester_approvals_decided_by_users_id_fk` FOREIGN KEY (`decided_by`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `users` ADD CONSTRAINT `users_program_id_programs_id_fk` FOREIGN KEY (`program_id`) REFERENCES `programs`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `users` ADD CONSTRAINT `users_company_id_companies_id_fk` FOREIGN KEY (`company_id`) REFERENCES `companies`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `attachments` ADD CONSTRAINT `attachments_uploaded_by_users_id_fk` FOREIGN KEY (`uploaded_by`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `certifications` ADD CONSTRAINT `certifications_tester_id_users_id_fk` FOREIGN KEY (`tester_id`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `certifications` ADD CONSTRAINT `certifications_attachment_id_attachments_id_fk` FOREIGN KEY (`attachment_id`) REFERENCES `attachments`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `test_kits` ADD CONSTRAINT `test_kits_tester_id_users_id_fk` FOREIGN KEY (`tester_id`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `test_kits` ADD CONSTRAINT `test_kits_attachment_id_attachments_id_fk` FOREIGN KEY (`attachment_id`) REFERENCES `attachments`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `assemblies` ADD CONSTRAINT `assemblies_program_id_programs_id_fk` FOREIGN KEY (`program_id`) REFERENCES `programs`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `assemblies` ADD CONSTRAINT `assemblies_site_id_sites_id_fk` FOREIGN KEY (`site_id`) REFERENCES `sites`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `assemblies` ADD CONSTRAINT `assemblies_registered_by_users_id_fk` FOREIGN KEY (`registered_by`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `owners` ADD CONSTRAINT `owners_program_id_programs_id_fk` FOREIGN KEY (`program_id`) REFERENCES `programs`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `owners` ADD CONSTRAINT `owners_user_id_users_id_fk` FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `site_owners` ADD CONSTRAINT `site_owners_site_id_sites_id_fk` FOREIGN KEY (`site_id`) REFERENCES `sites`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `site_owners` ADD CONSTRAINT `site_owners_owner_id_owners_id_fk` FOREIGN KEY (`owner_id`) REFERENCES `owners`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `sites` ADD CONSTRAINT `sites_program_id_programs_id_fk` FOREIGN KEY (`program_id`) REFERENCES `programs`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `certificates` ADD CONSTRAINT `certificates_report_id_test_reports_id_fk` FOREIGN KEY (`report_id`) REFERENCES `test_reports`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `certificates` ADD CONSTRAINT `certificates_issued_by_users_id_fk` FOREIGN KEY (`issued_by`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `report_drafts` ADD CONSTRAINT `report_drafts_tester_id_users_id_fk` FOREIGN KEY (`tester_id`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `report_drafts` ADD CONSTRAINT `report_drafts_program_id_programs_id_fk` FOREIGN KEY (`program_id`) REFERENCES `programs`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `report_drafts` ADD CONSTRAINT `report_drafts_assembly_id_assemblies_id_fk` FOREIGN KEY (`assembly_id`) REFERENCES `assemblies`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `report_readings` ADD CONSTRAINT `report_readings_report_id_test_reports_id_fk` FOREIGN KEY (`report_id`) REFERENCES `test_reports`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `report_repairs` ADD CONSTRAINT `report_repairs_report_id_test_reports_id_fk` FOREIGN KEY (`report_id`) REFERENCES `test_reports`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `reviews` ADD CONSTRAINT `reviews_report_id_test_reports_id_fk` FOREIGN KEY (`report_id`) REFERENCES `test_reports`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `reviews` ADD CONSTRAINT `reviews_inspector_id_users_id_fk` FOREIGN KEY (`inspector_id`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `test_reports` ADD CONSTRAINT `test_reports_program_id_programs_id_fk` FOREIGN KEY (`program_id`) REFERENCES `programs`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `test_reports` ADD CONSTRAINT `test_reports_assembly_id_assemblies_id_fk` FOREIGN KEY (`assembly_id`) REFERENCES `assemblies`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `test_reports` ADD CONSTRAINT `test_reports_tester_id_users_id_fk` FOREIGN KEY (`tester_id`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `test_reports` ADD CONSTRAINT `test_reports_kit_id_test_kits_id_fk` FOREIGN KEY (`kit_id`) REFERENCES `test_kits`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `test_reports` ADD CONSTRAINT `test_reports_certification_id_certifications_id_fk` FOREIGN KEY (`certification_id`) REFERENCES `certifications`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `test_reports` ADD CONSTRAINT `test_reports_decided_by_users_id_fk` FOREIGN KEY (`decided_by`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `notice_runs` ADD CONSTRAINT `notice_runs_program_id_programs_id_fk` FOREIGN KEY (`program_id`) REFERENCES `programs`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `notice_runs` ADD CONSTRAINT `notice_runs_started_by_users_id_fk` FOREIGN KEY (`started_by`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `notices` ADD CONSTRAINT `notices_program_id_programs_id_fk` FOREIGN KEY (`program_id`) REFERENCES `programs`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `notices` ADD CONSTRAINT `notices_assembly_id_assemblies_id_fk` FOREIGN KEY (`assembly_id`) REFERENCES `assemblies`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `notices` ADD CONSTRAINT `notices_owner_id_owners_id_fk` FOREIGN KEY (`owner_id`) REFERENCES `owners`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `import_jobs` ADD CONSTRAINT `import_jobs_program_id_programs_id_fk` FOREIGN KEY (`program_id`) REFERENCES `programs`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `import_jobs` ADD CONSTRAINT `import_jobs_created_by_users_id_fk` FOREIGN KEY (`created_by`) REFERENCES `users`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `import_jobs` ADD CONSTRAINT `import_jobs_file_id_attachments_id_fk` FOREIGN KEY (`file_id`) REFERENCES `attachments`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE `import_jobs` ADD CONSTRAINT `import_jobs_error_file_id_attachments_id_fk` FOREIGN KEY (`error_file_id`) REFERENCES `attachments`(`id`) ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX `return_reasons_program_idx` ON `return_reasons` (`program_id`,`is_active`,`sort_order`);--> statement-breakpoint
CREATE INDEX `auth_tokens_user_idx` ON `auth_tokens` (`user_id`,`purpose`);--> statement-breakpoint
CREATE INDEX `sessions_user_idx` ON `sessions` (`user_id`);--> statement-breakpoint
CREATE INDEX `tester_approvals_status_idx` ON `tester_approvals` (`program_id`,`status`);--> statement-breakpoint
CREATE INDEX `tester_approvals_tester_idx` ON `tester_approvals` (`tester_id`);--> statement-breakpoint
CREATE INDEX `users_program_role_idx` ON `users` (`program_id`,`role`);--> statement-breakpoint
CREATE INDEX `users_company_idx` ON `users` (`company_id`);--> statement-breakpoint
CREATE INDEX `attachments_uploader_idx` ON `attachments` (`uploaded_by`);--> statement-breakpoint
CREATE INDEX `certifications_tester_idx` ON `certifications` (`tester_id`,`expires_on`);--> statement-breakpoint
CREATE INDEX `assemblies_site_idx` ON `assemblies` (`site_id`);--> statement-breakpoint
CREATE INDEX `assemblies_serial_idx` ON `assemblies` (`program_id`,`serial`);--> statement-breakpoint
CREATE INDEX `assemblies_make_serial_idx` ON `assemblies` (`program_id`,`make`,`serial`);--> statement-breakpoint
CREATE INDEX `assemblies_due_idx` ON `assemblies` (`program_id`,`base_state`,`next_due_on`);--> statement-breakpoint
CREATE INDEX `assemblies_repair_idx` ON `assemblies` (`program_id`,`base_state`,`repair_due_on`);--> statement-breakpoint
CREATE INDEX `assemblies_kind_idx` ON `assemblies` (`program_id`,`kind`,`hazard`);--> statement-breakpoint
CREATE INDEX `owners_program_email_idx` ON `owners` (`program_id`,`email`);--> statement-breakpoint
CREATE INDEX `owners_user_idx` ON `owners` (`user_id`);--> statement-breakpoint
CREATE INDEX `site_owners_owner_idx` ON `site_owners` (`owner_id`);--> statement-breakpoint
CREATE INDEX `sites_address_idx` ON `sites` (`program_id`,`address_line1`);--> statement-breakpoint
CREATE INDEX `sites_name_idx` ON `sites` (`program_id`,`name`);--> statement-breakpoint
CREATE INDEX `certificates_report_idx` ON `certificates` (`report_id`);--> statement-breakpoint
CREATE INDEX `report_drafts_tester_idx` ON `report_drafts` (`tester_id`,`updated_at`);--> statement-breakpoint
CREATE INDEX `report_repairs_report_idx` ON `report_repairs` (`report_id`);--> statement-breakpoint
CREATE INDEX `reviews_inspector_idx` ON `reviews` (`inspector_id`,`decided_at`);--> statement-breakpoint
CREATE INDEX `test_reports_queue_idx` ON `test_reports` (`program_id`,`status`,`submitted_at`);--> statement-breakpoint
CREATE INDEX `test_reports_tester_idx` ON `test_reports` (`tester_id`,`submitted_at`);--> statement-breakpoint
CREATE INDEX `test_reports_tester_time_idx` ON `test_reports` (`tester_id`,`tested_at`);--> statement-breakpoint
CREATE INDEX `test_reports_assembly_idx` ON `test_reports` (`assembly_id`,`tested_on`);--> statement-breakpoint
CREATE INDEX `test_reports_program_date_idx` ON `test_reports` (`program_id`,`tested_on`);--> statement-breakpoint
CREATE INDEX `test_reports_fingerprint_idx` ON `test_reports` (`program_id`,`tested_on`,`fingerprint`);--> statement-breakpoint
CREATE INDEX `notice_runs_program_idx` ON `notice_runs` (`program_id`,`started_at`);--> statement-breakpoint
CREATE INDEX `notices_status_idx` ON `notices` (`program_id`,`status`,`next_attempt_at`);--> statement-breakpoint
CREATE INDEX `notices_assembly_idx` ON `notices` (`assembly_id`,`due_cycle`);--> statement-breakpoint
CREATE INDEX `notices_planned_idx` ON `notices` (`program_id`,`planned_on`);--> statement-breakpoint
CREATE INDEX `audit_program_at_idx` ON `audit_log` (`program_id`,`at`);--> statement-breakpoint
CREATE INDEX `audit_entity_idx` ON `audit_log` (`entity_type`,`entity_id`);--> statement-breakpoint
CREATE INDEX `audit_actor_idx` ON `audit_log` (`actor_id`,`at`);--> statement-breakpoint
CREATE INDEX `import_jobs_program_idx` ON `import_jobs` (`program_id`,`started_at`);