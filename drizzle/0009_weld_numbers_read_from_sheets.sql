CREATE TABLE `retired_weld_numbers` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`drawing_id` integer NOT NULL,
	`number` text NOT NULL,
	`key` text NOT NULL,
	`joint_id` integer,
	`retired_by` text,
	`retired_at` integer DEFAULT (cast(unixepoch('subsec') * 1000 as integer)) NOT NULL,
	FOREIGN KEY (`drawing_id`) REFERENCES `drawings`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`joint_id`) REFERENCES `joints`(`id`) ON UPDATE no action ON DELETE set null,
	FOREIGN KEY (`retired_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `retired_weld_numbers_drawing_key` ON `retired_weld_numbers` (`drawing_id`,`key`);--> statement-breakpoint
CREATE TABLE `sheet_readings` (
	`revision_id` integer PRIMARY KEY NOT NULL,
	`status` text DEFAULT 'queued' NOT NULL,
	`text_layer` integer,
	`found` integer DEFAULT 0 NOT NULL,
	`error` text,
	`pins_carried` integer,
	`pins_moved` integer,
	`pins_flagged` integer,
	`read_ms` integer,
	`queued_at` integer DEFAULT (cast(unixepoch('subsec') * 1000 as integer)) NOT NULL,
	`finished_at` integer,
	FOREIGN KEY (`revision_id`) REFERENCES `revisions`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE TABLE `sheet_suggestions` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`revision_id` integer NOT NULL,
	`page_index` integer NOT NULL,
	`number` text NOT NULL,
	`x` real NOT NULL,
	`y` real NOT NULL,
	`target_x` real,
	`target_y` real,
	`status` text DEFAULT 'open' NOT NULL,
	`joint_id` integer,
	`decided_by` text,
	`decided_at` integer,
	`created_at` integer DEFAULT (cast(unixepoch('subsec') * 1000 as integer)) NOT NULL,
	FOREIGN KEY (`revision_id`) REFERENCES `revisions`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`joint_id`) REFERENCES `joints`(`id`) ON UPDATE no action ON DELETE set null,
	FOREIGN KEY (`decided_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `sheet_suggestions_revision_status` ON `sheet_suggestions` (`revision_id`,`status`);--> statement-breakpoint
CREATE UNIQUE INDEX `sheet_suggestions_revision_number` ON `sheet_suggestions` (`revision_id`,`number`);--> statement-breakpoint
ALTER TABLE `drawings` ADD `version` integer DEFAULT 1 NOT NULL;--> statement-breakpoint
ALTER TABLE `pins` ADD `review_reason` text;