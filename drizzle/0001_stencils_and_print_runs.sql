CREATE TABLE `apertures` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`stencil_id` integer NOT NULL,
	`refdes` text NOT NULL,
	`pad` text NOT NULL,
	`shape` text NOT NULL,
	`length_um` real,
	`width_um` real,
	`corner_radius_um` real,
	`diameter_um` real,
	`vertices_um` text,
	`x_um` real DEFAULT 0 NOT NULL,
	`y_um` real DEFAULT 0 NOT NULL,
	`rotation_deg` real DEFAULT 0 NOT NULL,
	FOREIGN KEY (`stencil_id`) REFERENCES `stencils`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `apertures_stencil_refdes_idx` ON `apertures` (`stencil_id`,`refdes`,`pad`);--> statement-breakpoint
CREATE TABLE `stencil_step_regions` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`stencil_id` integer NOT NULL,
	`x_min_um` real NOT NULL,
	`y_min_um` real NOT NULL,
	`x_max_um` real NOT NULL,
	`y_max_um` real NOT NULL,
	`thickness_um` real NOT NULL,
	FOREIGN KEY (`stencil_id`) REFERENCES `stencils`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE TABLE `stencils` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`site_id` integer,
	`name` text NOT NULL,
	`revision` text NOT NULL,
	`thickness_um` real NOT NULL,
	`technology` text NOT NULL,
	`rated_life_prints` integer,
	`notes` text DEFAULT '' NOT NULL,
	`state` text DEFAULT 'available' NOT NULL,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	`created_by_user_id` integer,
	FOREIGN KEY (`site_id`) REFERENCES `sites`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`created_by_user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `stencils_name_revision_idx` ON `stencils` (`name`,`revision`);--> statement-breakpoint
CREATE TABLE `print_runs` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`line_id` integer NOT NULL,
	`product_id` integer NOT NULL,
	`stencil_id` integer,
	`parameters` text NOT NULL,
	`ambient_temp_c` real,
	`relative_humidity_pct` real,
	`operator_user_id` integer,
	`started_at` integer NOT NULL,
	`ended_at` integer,
	`boards_printed` integer DEFAULT 0 NOT NULL,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	FOREIGN KEY (`line_id`) REFERENCES `lines`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`product_id`) REFERENCES `products`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`stencil_id`) REFERENCES `stencils`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`operator_user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `print_runs_line_time_idx` ON `print_runs` (`line_id`,`started_at`);