CREATE INDEX `inspections_supersedes` ON `inspections` (`supersedes_id`);--> statement-breakpoint
CREATE INDEX `joints_drawing_sort` ON `joints` (`drawing_id`,`sort_key`);--> statement-breakpoint
CREATE INDEX `joints_project_since` ON `joints` (`project_id`,`state_since`);--> statement-breakpoint
CREATE INDEX `joints_project_drawing_state` ON `joints` (`project_id`,`drawing_id`,`state`);