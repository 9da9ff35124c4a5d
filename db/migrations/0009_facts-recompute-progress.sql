ALTER TABLE `program_settings` ADD `facts_recompute_done` int unsigned;--> statement-breakpoint
ALTER TABLE `program_settings` ADD `facts_recompute_total` int unsigned;--> statement-breakpoint
ALTER TABLE `program_settings` ADD `facts_recompute_at` datetime(3);