CREATE TABLE `spc_characteristics` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`name` text NOT NULL,
	`product_id` integer NOT NULL,
	`line_ids` text NOT NULL,
	`measure` text NOT NULL,
	`parameter_key` text,
	`pad_selection` text NOT NULL,
	`subgroup_mode` text DEFAULT 'board' NOT NULL,
	`subgroup_size` integer DEFAULT 1 NOT NULL,
	`chart_kind` text NOT NULL,
	`lsl` real,
	`target` real,
	`usl` real,
	`unit` text DEFAULT '' NOT NULL,
	`rules` text NOT NULL,
	`active` integer DEFAULT true NOT NULL,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	`created_by_user_id` integer,
	FOREIGN KEY (`product_id`) REFERENCES `products`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`created_by_user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `spc_char_product_idx` ON `spc_characteristics` (`product_id`);--> statement-breakpoint
CREATE TABLE `spc_exclusions` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`characteristic_id` integer NOT NULL,
	`point_key` text NOT NULL,
	`reason` text NOT NULL,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	`created_by_user_id` integer,
	FOREIGN KEY (`characteristic_id`) REFERENCES `spc_characteristics`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`created_by_user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `spc_exclusions_char_key_idx` ON `spc_exclusions` (`characteristic_id`,`point_key`);--> statement-breakpoint
CREATE TABLE `spc_followers` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`characteristic_id` integer NOT NULL,
	`user_id` integer NOT NULL,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	FOREIGN KEY (`characteristic_id`) REFERENCES `spc_characteristics`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `spc_followers_char_user_idx` ON `spc_followers` (`characteristic_id`,`user_id`);--> statement-breakpoint
CREATE TABLE `spc_limit_versions` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`characteristic_id` integer NOT NULL,
	`version` integer NOT NULL,
	`limits` text NOT NULL,
	`baseline_from` integer,
	`baseline_to` integer,
	`baseline_points` integer NOT NULL,
	`excluded` text NOT NULL,
	`note` text DEFAULT '' NOT NULL,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	`created_by_user_id` integer,
	FOREIGN KEY (`characteristic_id`) REFERENCES `spc_characteristics`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`created_by_user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `spc_limit_versions_char_version_idx` ON `spc_limit_versions` (`characteristic_id`,`version`);--> statement-breakpoint
CREATE TABLE `spc_mail_queue` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`user_id` integer NOT NULL,
	`signal_id` integer NOT NULL,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`signal_id`) REFERENCES `spc_signals`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `spc_mail_queue_user_idx` ON `spc_mail_queue` (`user_id`);--> statement-breakpoint
CREATE TABLE `spc_signals` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`characteristic_id` integer NOT NULL,
	`limit_version_id` integer NOT NULL,
	`rule` text NOT NULL,
	`chart_part` text NOT NULL,
	`point_key` text NOT NULL,
	`point_keys` text NOT NULL,
	`board_ids` text NOT NULL,
	`point_at` integer,
	`value` real,
	`run_id` integer,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	`ack_cause` text,
	`ack_action` text,
	`ack_note` text,
	`ack_by_user_id` integer,
	`ack_by` text,
	`ack_at` integer,
	FOREIGN KEY (`characteristic_id`) REFERENCES `spc_characteristics`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`limit_version_id`) REFERENCES `spc_limit_versions`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`ack_by_user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `spc_signals_unique_idx` ON `spc_signals` (`characteristic_id`,`limit_version_id`,`rule`,`chart_part`,`point_key`);--> statement-breakpoint
CREATE INDEX `spc_signals_open_idx` ON `spc_signals` (`ack_at`,`characteristic_id`);