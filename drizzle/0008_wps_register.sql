CREATE TABLE `wps` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`project_id` integer NOT NULL,
	`number` text NOT NULL,
	`revision` text NOT NULL,
	`status` text DEFAULT 'draft' NOT NULL,
	`title` text DEFAULT '' NOT NULL,
	`processes` text NOT NULL,
	`material_groups` text NOT NULL,
	`ranges` text NOT NULL,
	`groove_type` text DEFAULT '' NOT NULL,
	`preheat_min` text,
	`interpass_max` text,
	`filler_classes` text NOT NULL,
	`pqrs` text NOT NULL,
	`version` integer DEFAULT 1 NOT NULL,
	`created_by` text,
	`created_at` integer DEFAULT (cast(unixepoch('subsec') * 1000 as integer)) NOT NULL,
	`updated_at` integer DEFAULT (cast(unixepoch('subsec') * 1000 as integer)) NOT NULL,
	FOREIGN KEY (`project_id`) REFERENCES `projects`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`created_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `wps_project_number_revision` ON `wps` (`project_id`,`number`,`revision`);--> statement-breakpoint
ALTER TABLE `joints` ADD `wps_id` integer REFERENCES wps(id);