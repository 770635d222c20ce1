CREATE TABLE `nde_indications` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`inspection_id` integer NOT NULL,
	`type` text NOT NULL,
	`length_text` text DEFAULT '' NOT NULL,
	`length_mm` real,
	`width_text` text DEFAULT '' NOT NULL,
	`width_mm` real,
	`depth_text` text DEFAULT '' NOT NULL,
	`depth_mm` real,
	`position_text` text DEFAULT '' NOT NULL,
	`position_mm` real,
	`darker` integer,
	`outcome` text,
	`rejected` integer DEFAULT false NOT NULL,
	FOREIGN KEY (`inspection_id`) REFERENCES `inspections`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE INDEX `nde_indications_inspection` ON `nde_indications` (`inspection_id`);--> statement-breakpoint
CREATE TABLE `nde_lot_joints` (
	`lot_id` integer NOT NULL,
	`joint_id` integer NOT NULL,
	`welded_at` integer NOT NULL,
	`added_at` integer DEFAULT (cast(unixepoch('subsec') * 1000 as integer)) NOT NULL,
	PRIMARY KEY(`lot_id`, `joint_id`),
	FOREIGN KEY (`lot_id`) REFERENCES `nde_lots`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`joint_id`) REFERENCES `joints`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE INDEX `nde_lot_joints_joint` ON `nde_lot_joints` (`joint_id`,`lot_id`);--> statement-breakpoint
CREATE TABLE `nde_lot_marks` (
	`project_id` integer PRIMARY KEY NOT NULL,
	`weld_id` integer DEFAULT 0 NOT NULL,
	FOREIGN KEY (`project_id`) REFERENCES `projects`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE TABLE `nde_lots` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`project_id` integer NOT NULL,
	`method` text NOT NULL,
	`percent` real NOT NULL,
	`kinds` text NOT NULL,
	`group_by` text NOT NULL,
	`group_key` text NOT NULL,
	`seq` integer DEFAULT 1 NOT NULL,
	`label` text NOT NULL,
	`every_welder` integer DEFAULT true NOT NULL,
	`status` text DEFAULT 'open' NOT NULL,
	`stage` text DEFAULT 'open' NOT NULL,
	`created_at` integer DEFAULT (cast(unixepoch('subsec') * 1000 as integer)) NOT NULL,
	`closed_by` text,
	`closed_at` integer,
	`close_note` text,
	FOREIGN KEY (`project_id`) REFERENCES `projects`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`closed_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `nde_lots_key` ON `nde_lots` (`project_id`,`method`,`percent`,`kinds`,`group_by`,`group_key`,`seq`);--> statement-breakpoint
CREATE INDEX `nde_lots_project_status` ON `nde_lots` (`project_id`,`status`,`label`);--> statement-breakpoint
CREATE INDEX `nde_lots_project_stage` ON `nde_lots` (`project_id`,`stage`,`label`);--> statement-breakpoint
CREATE TABLE `nde_request_items` (
	`request_id` integer NOT NULL,
	`selection_id` integer NOT NULL,
	`repair_cycle` integer DEFAULT 0 NOT NULL,
	`inspection_id` integer,
	PRIMARY KEY(`selection_id`, `repair_cycle`),
	FOREIGN KEY (`request_id`) REFERENCES `nde_requests`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`selection_id`) REFERENCES `nde_selections`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`inspection_id`) REFERENCES `inspections`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `nde_request_items_request` ON `nde_request_items` (`request_id`);--> statement-breakpoint
CREATE TABLE `nde_requests` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`project_id` integer NOT NULL,
	`sent_to` text NOT NULL,
	`note` text DEFAULT '' NOT NULL,
	`sent_by` text,
	`sent_at` integer DEFAULT (cast(unixepoch('subsec') * 1000 as integer)) NOT NULL,
	`closed_at` integer,
	FOREIGN KEY (`project_id`) REFERENCES `projects`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`sent_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `nde_requests_project` ON `nde_requests` (`project_id`,`sent_at`);--> statement-breakpoint
CREATE TABLE `nde_rounds` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`lot_id` integer NOT NULL,
	`seed` integer,
	`joints` integer NOT NULL,
	`required` integer NOT NULL,
	`candidates` integer NOT NULL,
	`committed_by` text,
	`committed_at` integer DEFAULT (cast(unixepoch('subsec') * 1000 as integer)) NOT NULL,
	FOREIGN KEY (`lot_id`) REFERENCES `nde_lots`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`committed_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `nde_rounds_lot` ON `nde_rounds` (`lot_id`,`committed_at`);--> statement-breakpoint
CREATE TABLE `nde_tracer_calls` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`lot_id` integer NOT NULL,
	`selection_id` integer NOT NULL,
	`inspection_id` integer,
	`welder_id` integer NOT NULL,
	`level` integer NOT NULL,
	`wanted` integer NOT NULL,
	`short` integer DEFAULT 0 NOT NULL,
	`called_at` integer DEFAULT (cast(unixepoch('subsec') * 1000 as integer)) NOT NULL,
	`withdrawn_at` integer,
	FOREIGN KEY (`lot_id`) REFERENCES `nde_lots`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`selection_id`) REFERENCES `nde_selections`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`inspection_id`) REFERENCES `inspections`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`welder_id`) REFERENCES `welders`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `nde_tracer_calls_lot` ON `nde_tracer_calls` (`lot_id`);--> statement-breakpoint
CREATE INDEX `nde_tracer_calls_selection` ON `nde_tracer_calls` (`selection_id`);--> statement-breakpoint
DROP INDEX `joints_project_rank`;--> statement-breakpoint
CREATE INDEX `joints_project_rank` ON `joints` (`project_id`,(case "state" when 'awaiting_fitup' then 0 when 'fitup_rejected' then 1 when 'ready_to_weld' then 2 when 'awaiting_visual' then 3 when 'repair' then 4 when 'awaiting_nde' then 5 when 'awaiting_lot' then 6 when 'accepted_by_lot' then 7 when 'accepted' then 8 when 'void' then 9 end),`state_since`);--> statement-breakpoint
ALTER TABLE `nde_selections` ADD `lot_id` integer REFERENCES nde_lots(id);--> statement-breakpoint
ALTER TABLE `nde_selections` ADD `round_id` integer REFERENCES nde_rounds(id);--> statement-breakpoint
ALTER TABLE `nde_selections` ADD `level` integer DEFAULT 0 NOT NULL;--> statement-breakpoint
ALTER TABLE `nde_selections` ADD `welder_id` integer REFERENCES welders(id);--> statement-breakpoint
ALTER TABLE `nde_selections` ADD `tracer_of_id` integer REFERENCES nde_selections(id);--> statement-breakpoint
ALTER TABLE `nde_selections` ADD `replaces_id` integer REFERENCES nde_selections(id);--> statement-breakpoint
ALTER TABLE `nde_selections` ADD `carried` integer DEFAULT false NOT NULL;--> statement-breakpoint
ALTER TABLE `nde_selections` ADD `note` text;--> statement-breakpoint
ALTER TABLE `nde_selections` ADD `cancelled_by` text REFERENCES users(id);--> statement-breakpoint
CREATE INDEX `nde_selections_lot` ON `nde_selections` (`lot_id`,`cancelled_at`);