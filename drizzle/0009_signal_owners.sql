ALTER TABLE `spc_signals` ADD `assignee_user_id` integer REFERENCES users(id);--> statement-breakpoint
ALTER TABLE `spc_signals` ADD `assigned_at` integer;--> statement-breakpoint
ALTER TABLE `spc_signals` ADD `escalated_at` integer;