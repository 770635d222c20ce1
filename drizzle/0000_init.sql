CREATE TABLE `accounts` (
	`user_id` text NOT NULL,
	`type` text NOT NULL,
	`provider` text NOT NULL,
	`provider_account_id` text NOT NULL,
	`refresh_token` text,
	`access_token` text,
	`expires_at` integer,
	`token_type` text,
	`scope` text,
	`id_token` text,
	`session_state` text,
	PRIMARY KEY(`provider`, `provider_account_id`),
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE INDEX `accounts_user` ON `accounts` (`user_id`);--> statement-breakpoint
CREATE TABLE `api_tokens` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`user_id` text NOT NULL,
	`name` text NOT NULL,
	`token_hash` text NOT NULL,
	`prefix` text NOT NULL,
	`created_at` integer DEFAULT (cast(unixepoch('subsec') * 1000 as integer)) NOT NULL,
	`last_used_at` integer,
	`revoked_at` integer,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE UNIQUE INDEX `api_tokens_token_hash_unique` ON `api_tokens` (`token_hash`);--> statement-breakpoint
CREATE INDEX `api_tokens_user` ON `api_tokens` (`user_id`);--> statement-breakpoint
CREATE TABLE `audit_events` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`at` integer DEFAULT (cast(unixepoch('subsec') * 1000 as integer)) NOT NULL,
	`user_id` text,
	`actor_email` text,
	`project_id` integer,
	`action` text NOT NULL,
	`entity` text NOT NULL,
	`entity_id` text,
	`before` text,
	`after` text,
	`ip` text,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`project_id`) REFERENCES `projects`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE INDEX `audit_project_time` ON `audit_events` (`project_id`,`at`);--> statement-breakpoint
CREATE INDEX `audit_entity` ON `audit_events` (`entity`,`entity_id`);--> statement-breakpoint
CREATE INDEX `audit_user_time` ON `audit_events` (`user_id`,`at`);--> statement-breakpoint
CREATE TABLE `criteria_sets` (
	`id` text PRIMARY KEY NOT NULL,
	`project_id` integer NOT NULL,
	`base_id` text NOT NULL,
	`name` text NOT NULL,
	`version` integer DEFAULT 1 NOT NULL,
	`overrides` text NOT NULL,
	`created_by` text,
	`created_at` integer DEFAULT (cast(unixepoch('subsec') * 1000 as integer)) NOT NULL,
	FOREIGN KEY (`project_id`) REFERENCES `projects`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`created_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `criteria_sets_project` ON `criteria_sets` (`project_id`);--> statement-breakpoint
CREATE TABLE `drawings` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`project_id` integer NOT NULL,
	`number` text NOT NULL,
	`title` text DEFAULT '' NOT NULL,
	`kind` text NOT NULL,
	`line` text DEFAULT '' NOT NULL,
	`area` text DEFAULT '' NOT NULL,
	`system` text DEFAULT '' NOT NULL,
	`created_at` integer DEFAULT (cast(unixepoch('subsec') * 1000 as integer)) NOT NULL,
	FOREIGN KEY (`project_id`) REFERENCES `projects`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE UNIQUE INDEX `drawings_project_number` ON `drawings` (`project_id`,`number`);--> statement-breakpoint
CREATE INDEX `drawings_project_area` ON `drawings` (`project_id`,`area`);--> statement-breakpoint
CREATE INDEX `drawings_project_kind` ON `drawings` (`project_id`,`kind`);--> statement-breakpoint
CREATE INDEX `drawings_project_system` ON `drawings` (`project_id`,`system`);--> statement-breakpoint
CREATE TABLE `exports` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`project_id` integer NOT NULL,
	`scope` text NOT NULL,
	`scope_key` text NOT NULL,
	`status` text DEFAULT 'queued' NOT NULL,
	`progress` real DEFAULT 0 NOT NULL,
	`current` text,
	`report` text DEFAULT '[]' NOT NULL,
	`file_key` text,
	`bytes` integer,
	`sha256` text,
	`requested_by` text,
	`created_at` integer DEFAULT (cast(unixepoch('subsec') * 1000 as integer)) NOT NULL,
	`started_at` integer,
	`finished_at` integer,
	FOREIGN KEY (`project_id`) REFERENCES `projects`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`requested_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `exports_project` ON `exports` (`project_id`,`created_at`);--> statement-breakpoint
CREATE INDEX `exports_key` ON `exports` (`scope_key`,`status`);--> statement-breakpoint
CREATE TABLE `inspection_requests` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`project_id` integer NOT NULL,
	`batch` text NOT NULL,
	`joint_id` integer NOT NULL,
	`stage` text NOT NULL,
	`note` text DEFAULT '' NOT NULL,
	`requested_by` text,
	`requested_at` integer DEFAULT (cast(unixepoch('subsec') * 1000 as integer)) NOT NULL,
	`closed_at` integer,
	`closed_by_inspection_id` integer,
	FOREIGN KEY (`project_id`) REFERENCES `projects`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`joint_id`) REFERENCES `joints`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`requested_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`closed_by_inspection_id`) REFERENCES `inspections`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `inspection_requests_open` ON `inspection_requests` (`project_id`,`closed_at`,`requested_at`);--> statement-breakpoint
CREATE INDEX `inspection_requests_joint` ON `inspection_requests` (`joint_id`);--> statement-breakpoint
CREATE TABLE `inspections` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`joint_id` integer NOT NULL,
	`stage` text NOT NULL,
	`method` text,
	`repair_cycle` integer DEFAULT 0 NOT NULL,
	`readings` text DEFAULT '[]' NOT NULL,
	`verdict` text,
	`findings` text DEFAULT '[]' NOT NULL,
	`criteria_set_id` text,
	`criteria_set_version` integer,
	`decision` text NOT NULL,
	`reason` text,
	`against_verdict` integer DEFAULT false NOT NULL,
	`report_no` text,
	`technician` text,
	`inspector_id` text NOT NULL,
	`inspected_at` integer DEFAULT (cast(unixepoch('subsec') * 1000 as integer)) NOT NULL,
	`supersedes_id` integer,
	FOREIGN KEY (`joint_id`) REFERENCES `joints`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`inspector_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`supersedes_id`) REFERENCES `inspections`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `inspections_joint` ON `inspections` (`joint_id`,`stage`,`inspected_at`);--> statement-breakpoint
CREATE INDEX `inspections_inspector` ON `inspections` (`inspector_id`,`inspected_at`);--> statement-breakpoint
CREATE INDEX `inspections_time` ON `inspections` (`inspected_at`);--> statement-breakpoint
CREATE TABLE `joints` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`project_id` integer NOT NULL,
	`drawing_id` integer NOT NULL,
	`number` text NOT NULL,
	`sort_key` text NOT NULL,
	`kind` text NOT NULL,
	`location` text DEFAULT 'shop' NOT NULL,
	`line` text DEFAULT '' NOT NULL,
	`spool` text DEFAULT '' NOT NULL,
	`size_text` text DEFAULT '' NOT NULL,
	`diameter_mm` real,
	`thickness_text` text DEFAULT '' NOT NULL,
	`thickness_mm` real,
	`required_size_text` text DEFAULT '' NOT NULL,
	`required_size_mm` real,
	`material` text DEFAULT '' NOT NULL,
	`wps` text DEFAULT '' NOT NULL,
	`criteria_set_id` text NOT NULL,
	`nde_required` text DEFAULT '' NOT NULL,
	`void_reason` text,
	`voided_at` integer,
	`voided_by` text,
	`replaces_joint_id` integer,
	`state` text DEFAULT 'awaiting_fitup' NOT NULL,
	`repair_cycle` integer DEFAULT 0 NOT NULL,
	`state_since` integer DEFAULT (cast(unixepoch('subsec') * 1000 as integer)) NOT NULL,
	`version` integer DEFAULT 1 NOT NULL,
	`created_by` text,
	`created_at` integer DEFAULT (cast(unixepoch('subsec') * 1000 as integer)) NOT NULL,
	`updated_at` integer DEFAULT (cast(unixepoch('subsec') * 1000 as integer)) NOT NULL,
	FOREIGN KEY (`project_id`) REFERENCES `projects`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`drawing_id`) REFERENCES `drawings`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`voided_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`replaces_joint_id`) REFERENCES `joints`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`created_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `joints_drawing_number` ON `joints` (`drawing_id`,`number`);--> statement-breakpoint
CREATE INDEX `joints_project_state` ON `joints` (`project_id`,`state`,`state_since`);--> statement-breakpoint
CREATE INDEX `joints_project_sort` ON `joints` (`project_id`,`sort_key`);--> statement-breakpoint
CREATE INDEX `joints_project_line` ON `joints` (`project_id`,`line`);--> statement-breakpoint
CREATE TABLE `mail_messages` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`received_at` integer DEFAULT (cast(unixepoch('subsec') * 1000 as integer)) NOT NULL,
	`from` text NOT NULL,
	`to` text NOT NULL,
	`subject` text NOT NULL,
	`text` text DEFAULT '' NOT NULL,
	`html` text,
	`message_id` text
);
--> statement-breakpoint
CREATE INDEX `mail_messages_to` ON `mail_messages` (`to`,`received_at`);--> statement-breakpoint
CREATE TABLE `memberships` (
	`project_id` integer NOT NULL,
	`user_id` text NOT NULL,
	`role` text NOT NULL,
	`created_at` integer DEFAULT (cast(unixepoch('subsec') * 1000 as integer)) NOT NULL,
	PRIMARY KEY(`project_id`, `user_id`),
	FOREIGN KEY (`project_id`) REFERENCES `projects`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE INDEX `memberships_user` ON `memberships` (`user_id`);--> statement-breakpoint
CREATE TABLE `nde_selections` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`project_id` integer NOT NULL,
	`joint_id` integer NOT NULL,
	`method` text NOT NULL,
	`lot` text DEFAULT '' NOT NULL,
	`reason` text NOT NULL,
	`tracer_of_joint_id` integer,
	`selected_by` text,
	`selected_at` integer DEFAULT (cast(unixepoch('subsec') * 1000 as integer)) NOT NULL,
	`cancelled_at` integer,
	FOREIGN KEY (`project_id`) REFERENCES `projects`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`joint_id`) REFERENCES `joints`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`tracer_of_joint_id`) REFERENCES `joints`(`id`) ON UPDATE no action ON DELETE no action,
	FOREIGN KEY (`selected_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `nde_selections_joint` ON `nde_selections` (`joint_id`);--> statement-breakpoint
CREATE INDEX `nde_selections_project_lot` ON `nde_selections` (`project_id`,`lot`);--> statement-breakpoint
CREATE TABLE `pages` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`revision_id` integer NOT NULL,
	`page_index` integer NOT NULL,
	`x0` real NOT NULL,
	`y0` real NOT NULL,
	`x1` real NOT NULL,
	`y1` real NOT NULL,
	`rotation` integer DEFAULT 0 NOT NULL,
	FOREIGN KEY (`revision_id`) REFERENCES `revisions`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE UNIQUE INDEX `pages_revision_index` ON `pages` (`revision_id`,`page_index`);--> statement-breakpoint
CREATE TABLE `pins` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`joint_id` integer NOT NULL,
	`revision_id` integer NOT NULL,
	`page_index` integer NOT NULL,
	`x` real NOT NULL,
	`y` real NOT NULL,
	`needs_review` integer DEFAULT false NOT NULL,
	`created_by` text,
	`created_at` integer DEFAULT (cast(unixepoch('subsec') * 1000 as integer)) NOT NULL,
	`updated_at` integer DEFAULT (cast(unixepoch('subsec') * 1000 as integer)) NOT NULL,
	FOREIGN KEY (`joint_id`) REFERENCES `joints`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`revision_id`) REFERENCES `revisions`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`created_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `pins_joint_revision` ON `pins` (`joint_id`,`revision_id`);--> statement-breakpoint
CREATE INDEX `pins_revision_page` ON `pins` (`revision_id`,`page_index`);--> statement-breakpoint
CREATE TABLE `projects` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`code` text NOT NULL,
	`name` text NOT NULL,
	`client` text DEFAULT '' NOT NULL,
	`contractor` text DEFAULT '' NOT NULL,
	`site` text DEFAULT '' NOT NULL,
	`units` text DEFAULT 'imperial' NOT NULL,
	`default_criteria_set` text DEFAULT 'asme-b31.3-normal' NOT NULL,
	`weld_number_rule` text DEFAULT '{"shopPrefix":"","fieldPrefix":"FW-","sequence":"drawing"}' NOT NULL,
	`nde_lot_rule` text DEFAULT '{"groupBy":"line","percent":{"RT":5},"everyWelder":true}' NOT NULL,
	`created_at` integer DEFAULT (cast(unixepoch('subsec') * 1000 as integer)) NOT NULL
);
--> statement-breakpoint
CREATE UNIQUE INDEX `projects_code_unique` ON `projects` (`code`);--> statement-breakpoint
CREATE TABLE `revisions` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`drawing_id` integer NOT NULL,
	`label` text NOT NULL,
	`status` text NOT NULL,
	`note` text DEFAULT '' NOT NULL,
	`issued_on` text,
	`file_key` text NOT NULL,
	`file_name` text NOT NULL,
	`sha256` text NOT NULL,
	`bytes` integer NOT NULL,
	`page_count` integer NOT NULL,
	`uploaded_by` text,
	`uploaded_at` integer DEFAULT (cast(unixepoch('subsec') * 1000 as integer)) NOT NULL,
	`superseded_at` integer,
	FOREIGN KEY (`drawing_id`) REFERENCES `drawings`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`uploaded_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `revisions_drawing_label` ON `revisions` (`drawing_id`,`label`);--> statement-breakpoint
CREATE INDEX `revisions_drawing_status` ON `revisions` (`drawing_id`,`status`);--> statement-breakpoint
CREATE INDEX `revisions_sha256` ON `revisions` (`sha256`);--> statement-breakpoint
CREATE TABLE `sessions` (
	`session_token` text PRIMARY KEY NOT NULL,
	`user_id` text NOT NULL,
	`expires` integer NOT NULL,
	FOREIGN KEY (`user_id`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE TABLE `users` (
	`id` text PRIMARY KEY NOT NULL,
	`name` text,
	`email` text NOT NULL,
	`email_verified` integer,
	`image` text,
	`password_hash` text,
	`is_admin` integer DEFAULT false NOT NULL,
	`disabled_at` integer,
	`created_at` integer DEFAULT (cast(unixepoch('subsec') * 1000 as integer)) NOT NULL
);
--> statement-breakpoint
CREATE UNIQUE INDEX `users_email_unique` ON `users` (`email`);--> statement-breakpoint
CREATE TABLE `verification_tokens` (
	`identifier` text NOT NULL,
	`token` text NOT NULL,
	`expires` integer NOT NULL,
	PRIMARY KEY(`identifier`, `token`)
);
--> statement-breakpoint
CREATE TABLE `weld_welders` (
	`weld_id` integer NOT NULL,
	`welder_id` integer NOT NULL,
	`pass` text NOT NULL,
	PRIMARY KEY(`weld_id`, `welder_id`, `pass`),
	FOREIGN KEY (`weld_id`) REFERENCES `welds`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`welder_id`) REFERENCES `welders`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE INDEX `weld_welders_welder` ON `weld_welders` (`welder_id`);--> statement-breakpoint
CREATE TABLE `welder_qualifications` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`welder_id` integer NOT NULL,
	`process` text NOT NULL,
	`reference` text DEFAULT '' NOT NULL,
	`qualified_on` text NOT NULL,
	`expires_on` text,
	`last_used_on` text,
	FOREIGN KEY (`welder_id`) REFERENCES `welders`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE UNIQUE INDEX `welder_qualifications_process` ON `welder_qualifications` (`welder_id`,`process`);--> statement-breakpoint
CREATE TABLE `welders` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`project_id` integer NOT NULL,
	`stamp` text NOT NULL,
	`name` text NOT NULL,
	`employer` text DEFAULT '' NOT NULL,
	`status` text DEFAULT 'active' NOT NULL,
	`created_at` integer DEFAULT (cast(unixepoch('subsec') * 1000 as integer)) NOT NULL,
	FOREIGN KEY (`project_id`) REFERENCES `projects`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE UNIQUE INDEX `welders_project_stamp` ON `welders` (`project_id`,`stamp`);--> statement-breakpoint
CREATE TABLE `welds` (
	`id` integer PRIMARY KEY AUTOINCREMENT NOT NULL,
	`joint_id` integer NOT NULL,
	`repair_cycle` integer DEFAULT 0 NOT NULL,
	`welded_on` text NOT NULL,
	`wps` text DEFAULT '' NOT NULL,
	`process` text DEFAULT '' NOT NULL,
	`override_reason` text,
	`recorded_by` text,
	`recorded_at` integer DEFAULT (cast(unixepoch('subsec') * 1000 as integer)) NOT NULL,
	FOREIGN KEY (`joint_id`) REFERENCES `joints`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`recorded_by`) REFERENCES `users`(`id`) ON UPDATE no action ON DELETE no action
);
--> statement-breakpoint
CREATE UNIQUE INDEX `welds_joint_cycle` ON `welds` (`joint_id`,`repair_cycle`);