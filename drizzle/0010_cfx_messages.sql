CREATE TABLE `cfx_endpoints` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`handle` text NOT NULL,
	`line_id` integer NOT NULL,
	`kind` text NOT NULL,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	`created_by_user_id` integer,
	FOREIGN KEY (`line_id`) REFERENCES `lines`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`created_by_user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `cfx_endpoints_handle_idx` ON `cfx_endpoints` (`handle`);--> statement-breakpoint
CREATE TABLE `cfx_line_events` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`line_id` integer NOT NULL,
	`endpoint_id` integer NOT NULL,
	`kind` text NOT NULL,
	`at` integer NOT NULL,
	`detail` text NOT NULL,
	`message_key` text NOT NULL,
	FOREIGN KEY (`line_id`) REFERENCES `lines`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`endpoint_id`) REFERENCES `cfx_endpoints`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `cfx_line_events_line_at_idx` ON `cfx_line_events` (`line_id`,`at`);--> statement-breakpoint
CREATE TABLE `cfx_messages` (
	`message_key` text PRIMARY KEY NOT NULL,
	`received_at` integer NOT NULL,
	`outcome` text NOT NULL,
	`handle` text,
	`message_names` text DEFAULT '' NOT NULL,
	`sent_at` integer
);
--> statement-breakpoint
CREATE INDEX `cfx_messages_received_idx` ON `cfx_messages` (`received_at`);--> statement-breakpoint
CREATE TABLE `cfx_pending_inspections` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`message_key` text NOT NULL,
	`endpoint_id` integer NOT NULL,
	`line_id` integer NOT NULL,
	`unit_identifier` text NOT NULL,
	`inspected_at` integer NOT NULL,
	`recipe_name` text,
	`units` text NOT NULL,
	`pad_count` integer NOT NULL,
	`status` text DEFAULT 'pending' NOT NULL,
	`product_id` integer,
	`import_id` integer,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	FOREIGN KEY (`endpoint_id`) REFERENCES `cfx_endpoints`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`line_id`) REFERENCES `lines`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`product_id`) REFERENCES `products`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`import_id`) REFERENCES `spi_imports`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `cfx_pending_status_idx` ON `cfx_pending_inspections` (`status`,`inspected_at`);--> statement-breakpoint
CREATE TABLE `cfx_quarantine` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`message_key` text NOT NULL,
	`received_at` integer NOT NULL,
	`handle` text,
	`message_name` text,
	`reason` text NOT NULL,
	`body` blob,
	`content_encoding` text,
	`status` text DEFAULT 'held' NOT NULL,
	`resolved_at` integer,
	`resolved_by_user_id` integer,
	FOREIGN KEY (`resolved_by_user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `cfx_quarantine_status_idx` ON `cfx_quarantine` (`status`,`received_at`);--> statement-breakpoint
CREATE TABLE `cfx_units` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`endpoint_id` integer NOT NULL,
	`line_id` integer NOT NULL,
	`unit_identifier` text NOT NULL,
	`position_number` integer NOT NULL,
	`transaction_id` text,
	`print_run_id` integer,
	`product_id` integer,
	`recipe_name` text,
	`arrived_at` integer,
	`started_at` integer,
	`processed_at` integer,
	`completed_at` integer,
	`departed_at` integer,
	`result` text,
	`parameters` text,
	`deviations` text DEFAULT '[]' NOT NULL,
	`cycle_time_ms` integer,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	FOREIGN KEY (`endpoint_id`) REFERENCES `cfx_endpoints`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`line_id`) REFERENCES `lines`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`print_run_id`) REFERENCES `print_runs`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`product_id`) REFERENCES `products`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `cfx_units_unit_idx` ON `cfx_units` (`endpoint_id`,`unit_identifier`,`position_number`);--> statement-breakpoint
CREATE INDEX `cfx_units_line_time_idx` ON `cfx_units` (`line_id`,`processed_at`);--> statement-breakpoint
CREATE INDEX `cfx_units_run_idx` ON `cfx_units` (`print_run_id`);