ALTER TABLE `test_reports` ADD `assembly_kind` enum('RP','RPDA','DC','DCDA','PVB','SVB','AG');--> statement-breakpoint
UPDATE `test_reports` `r` JOIN `assemblies` `a` ON `a`.`id` = `r`.`assembly_id` SET `r`.`assembly_kind` = `a`.`kind`;--> statement-breakpoint
ALTER TABLE `test_reports` MODIFY `assembly_kind` enum('RP','RPDA','DC','DCDA','PVB','SVB','AG') NOT NULL;--> statement-breakpoint
CREATE INDEX `test_reports_queue_kind_idx` ON `test_reports` (`program_id`,`status`,`assembly_kind`,`submitted_at`);
