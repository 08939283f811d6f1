CREATE TABLE `paste_events` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`lot_id` integer NOT NULL,
	`event` text NOT NULL,
	`at` integer NOT NULL,
	`note` text DEFAULT '' NOT NULL,
	`user_id` integer,
	`actor` text NOT NULL,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	FOREIGN KEY (`lot_id`) REFERENCES `paste_lots`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `paste_events_lot_at_idx` ON `paste_events` (`lot_id`,`at`);--> statement-breakpoint
CREATE TABLE `paste_lots` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`lot_number` text NOT NULL,
	`alloy` text NOT NULL,
	`powder_type` integer NOT NULL,
	`flux_class` text,
	`container_grams` real,
	`received_on` text,
	`expires_on` text NOT NULL,
	`warm_up_minutes` integer NOT NULL,
	`max_on_stencil_minutes` integer NOT NULL,
	`max_out_of_cold_minutes` integer NOT NULL,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	`created_by_user_id` integer,
	FOREIGN KEY (`created_by_user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `paste_lots_lot_number_unique` ON `paste_lots` (`lot_number`);--> statement-breakpoint
CREATE TABLE `print_recipes` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`line_id` integer NOT NULL,
	`product_id` integer NOT NULL,
	`version` integer NOT NULL,
	`parameters` text NOT NULL,
	`note` text DEFAULT '' NOT NULL,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	`created_by_user_id` integer,
	FOREIGN KEY (`line_id`) REFERENCES `lines`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`product_id`) REFERENCES `products`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`created_by_user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `print_recipes_line_product_version_idx` ON `print_recipes` (`line_id`,`product_id`,`version`);--> statement-breakpoint
CREATE TABLE `stencil_events` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`stencil_id` integer NOT NULL,
	`kind` text NOT NULL,
	`at` integer NOT NULL,
	`from_state` text,
	`to_state` text,
	`readings_n_per_cm` text,
	`detail` text DEFAULT '' NOT NULL,
	`note` text DEFAULT '' NOT NULL,
	`user_id` integer,
	`actor` text NOT NULL,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	FOREIGN KEY (`stencil_id`) REFERENCES `stencils`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `stencil_events_stencil_at_idx` ON `stencil_events` (`stencil_id`,`at`);--> statement-breakpoint
ALTER TABLE `print_runs` ADD `recipe_id` integer REFERENCES print_recipes(id);--> statement-breakpoint
ALTER TABLE `print_runs` ADD `recipe_version` integer;--> statement-breakpoint
ALTER TABLE `print_runs` ADD `paste_lot_id` integer REFERENCES paste_lots(id);--> statement-breakpoint
ALTER TABLE `print_runs` ADD `blade_code` text;--> statement-breakpoint
ALTER TABLE `print_runs` ADD `deviations` text DEFAULT '[]' NOT NULL;--> statement-breakpoint
ALTER TABLE `print_runs` ADD `deviation_reasons` text DEFAULT '{}' NOT NULL;--> statement-breakpoint
ALTER TABLE `print_runs` ADD `warnings` text DEFAULT '[]' NOT NULL;--> statement-breakpoint
ALTER TABLE `print_runs` ADD `override_reason` text;--> statement-breakpoint
ALTER TABLE `print_runs` ADD `override_by_user_id` integer REFERENCES users(id);--> statement-breakpoint
ALTER TABLE `print_runs` ADD `corrections` integer DEFAULT 0 NOT NULL;--> statement-breakpoint
CREATE UNIQUE INDEX `print_runs_one_open_per_line_idx` ON `print_runs` (`line_id`) WHERE ended_at is null;--> statement-breakpoint
CREATE INDEX `print_runs_stencil_idx` ON `print_runs` (`stencil_id`);--> statement-breakpoint
CREATE INDEX `print_runs_lot_idx` ON `print_runs` (`paste_lot_id`);