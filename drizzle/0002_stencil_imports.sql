CREATE TABLE `aperture_imports` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`stencil_id` integer NOT NULL,
	`source` text NOT NULL,
	`file_name` text,
	`unit` text,
	`mode` text NOT NULL,
	`aperture_count` integer NOT NULL,
	`warnings` text NOT NULL,
	`created_at` integer DEFAULT (unixepoch('subsec') * 1000) NOT NULL,
	`created_by` text NOT NULL,
	FOREIGN KEY (`stencil_id`) REFERENCES `stencils`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `aperture_imports_stencil_idx` ON `aperture_imports` (`stencil_id`);--> statement-breakpoint
ALTER TABLE `stencils` ADD `based_on_stencil_id` integer REFERENCES stencils(id);