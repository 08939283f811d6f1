CREATE TABLE `spi_boards` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`serial` text NOT NULL,
	`inspected_at` integer NOT NULL,
	`line_code` text NOT NULL,
	`product_code` text NOT NULL,
	`line_id` integer,
	`product_id` integer,
	`import_id` integer NOT NULL,
	`print_run_id` integer,
	`stencil_id` integer,
	`stencil_name` text,
	`print_run_ref` text,
	`pad_count` integer NOT NULL,
	`pass_count` integer NOT NULL,
	`warn_count` integer NOT NULL,
	`fail_count` integer NOT NULL,
	`volume_pct_count` integer DEFAULT 0 NOT NULL,
	`volume_pct_mean` real,
	`volume_pct_sd` real,
	`volume_pct_min` real,
	`volume_pct_max` real,
	`volume_pct_range` real,
	`area_pct_count` integer DEFAULT 0 NOT NULL,
	`area_pct_mean` real,
	`area_pct_sd` real,
	`area_pct_min` real,
	`area_pct_max` real,
	`area_pct_range` real,
	`height_um_count` integer DEFAULT 0 NOT NULL,
	`height_um_mean` real,
	`height_um_sd` real,
	`height_um_min` real,
	`height_um_max` real,
	`height_um_range` real,
	`offset_x_um_count` integer DEFAULT 0 NOT NULL,
	`offset_x_um_mean` real,
	`offset_x_um_sd` real,
	`offset_x_um_min` real,
	`offset_x_um_max` real,
	`offset_x_um_range` real,
	`offset_y_um_count` integer DEFAULT 0 NOT NULL,
	`offset_y_um_mean` real,
	`offset_y_um_sd` real,
	`offset_y_um_min` real,
	`offset_y_um_max` real,
	`offset_y_um_range` real,
	`te_count` integer DEFAULT 0 NOT NULL,
	`te_mean` real,
	`te_sd` real,
	`te_min` real,
	`te_max` real,
	`te_range` real,
	FOREIGN KEY (`line_id`) REFERENCES `lines`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`product_id`) REFERENCES `products`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`import_id`) REFERENCES `spi_imports`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`print_run_id`) REFERENCES `print_runs`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`stencil_id`) REFERENCES `stencils`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `spi_boards_serial_time_idx` ON `spi_boards` (`serial`,`inspected_at`);--> statement-breakpoint
CREATE INDEX `spi_boards_product_time_idx` ON `spi_boards` (`product_code`,`inspected_at`);--> statement-breakpoint
CREATE INDEX `spi_boards_line_time_idx` ON `spi_boards` (`line_code`,`inspected_at`);--> statement-breakpoint
CREATE INDEX `spi_boards_print_run_idx` ON `spi_boards` (`print_run_id`);--> statement-breakpoint
CREATE INDEX `spi_boards_import_idx` ON `spi_boards` (`import_id`);--> statement-breakpoint
CREATE TABLE `spi_imports` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`source` text NOT NULL,
	`file_name` text NOT NULL,
	`sha256` text NOT NULL,
	`size_bytes` integer NOT NULL,
	`status` text NOT NULL,
	`duplicate_of_import_id` integer,
	`profile_id` integer,
	`profile_name` text,
	`created_by` text NOT NULL,
	`user_id` integer,
	`source_path` text,
	`started_at` integer NOT NULL,
	`finished_at` integer NOT NULL,
	`data_rows` integer DEFAULT 0 NOT NULL,
	`boards` integer DEFAULT 0 NOT NULL,
	`pads` integer DEFAULT 0 NOT NULL,
	`rejected_rows` integer DEFAULT 0 NOT NULL,
	`duplicate_boards` integer DEFAULT 0 NOT NULL,
	`error_count` integer DEFAULT 0 NOT NULL,
	`errors` text DEFAULT '[]' NOT NULL,
	`warnings` text DEFAULT '[]' NOT NULL,
	`archive_path` text,
	FOREIGN KEY (`profile_id`) REFERENCES `spi_profiles`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `spi_imports_sha256_imported_idx` ON `spi_imports` (`sha256`) WHERE status = 'imported';--> statement-breakpoint
CREATE INDEX `spi_imports_started_idx` ON `spi_imports` (`started_at`);--> statement-breakpoint
CREATE INDEX `spi_imports_source_path_idx` ON `spi_imports` (`source_path`);--> statement-breakpoint
CREATE TABLE `spi_pad_measurements` (
	`board_id` integer NOT NULL,
	`pad_id` integer NOT NULL,
	`volume_centi_pct` integer,
	`area_centi_pct` integer NOT NULL,
	`height_centi_um` integer NOT NULL,
	`offset_x_centi_um` integer NOT NULL,
	`offset_y_centi_um` integer NOT NULL,
	`result` integer NOT NULL,
	`volume_um3` integer,
	PRIMARY KEY(`board_id`, `pad_id`)
) WITHOUT ROWID;
--> statement-breakpoint
CREATE TABLE `spi_pads` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`product_code` text NOT NULL,
	`panel_index` integer DEFAULT 0 NOT NULL,
	`refdes` text NOT NULL,
	`pad` text NOT NULL,
	`aperture_id` integer,
	FOREIGN KEY (`aperture_id`) REFERENCES `apertures`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `spi_pads_key_idx` ON `spi_pads` (`product_code`,`refdes`,`pad`,`panel_index`);--> statement-breakpoint
CREATE TABLE `spi_profiles` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`name` text NOT NULL,
	`machine` text NOT NULL,
	`profile` text NOT NULL,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	`updated_at` integer,
	`created_by` text NOT NULL
);
--> statement-breakpoint
CREATE UNIQUE INDEX `spi_profiles_name_idx` ON `spi_profiles` (`name`);