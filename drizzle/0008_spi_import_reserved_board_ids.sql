ALTER TABLE `spi_imports` ADD `board_id_from` integer;--> statement-breakpoint
ALTER TABLE `spi_imports` ADD `board_id_to` integer;