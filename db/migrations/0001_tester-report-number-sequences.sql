CREATE TABLE `report_number_sequences` (
	`program_id` int unsigned NOT NULL,
	`year` smallint unsigned NOT NULL,
	`last_number` int unsigned NOT NULL,
	CONSTRAINT `report_number_sequences_program_id_year_pk` PRIMARY KEY(`program_id`,`year`)
);
--> statement-breakpoint
ALTER TABLE `report_number_sequences` ADD CONSTRAINT `report_number_sequences_program_id_programs_id_fk` FOREIGN KEY (`program_id`) REFERENCES `programs`(`id`) ON DELETE no action ON UPDATE no action;