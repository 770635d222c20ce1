CREATE TABLE `sheet_tiles` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`revision_id` integer NOT NULL,
	`page_index` integer NOT NULL,
	`status` text DEFAULT 'queued' NOT NULL,
	`raster` integer DEFAULT false NOT NULL,
	`format` text,
	`tile_size` integer DEFAULT 512 NOT NULL,
	`width` real,
	`height` real,
	`levels` text DEFAULT '[]' NOT NULL,
	`tiles` integer DEFAULT 0 NOT NULL,
	`bytes` integer DEFAULT 0 NOT NULL,
	`render_ms` integer,
	`error` text,
	`queued_at` integer DEFAULT (cast(unixepoch('subsec') * 1000 as integer)) NOT NULL,
	`finished_at` integer,
	FOREIGN KEY (`revision_id`) REFERENCES `revisions`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE UNIQUE INDEX `sheet_tiles_revision_page` ON `sheet_tiles` (`revision_id`,`page_index`);--> statement-breakpoint
CREATE INDEX `sheet_tiles_status` ON `sheet_tiles` (`status`);