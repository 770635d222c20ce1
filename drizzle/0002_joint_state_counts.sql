CREATE TABLE `joint_state_counts` (
	`project_id` integer NOT NULL,
	`drawing_id` integer NOT NULL,
	`state` text NOT NULL,
	`n` integer NOT NULL,
	PRIMARY KEY(`drawing_id`, `state`),
	FOREIGN KEY (`project_id`) REFERENCES `projects`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`drawing_id`) REFERENCES `drawings`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE INDEX `joint_state_counts_project` ON `joint_state_counts` (`project_id`,`drawing_id`,`state`,`n`);--> statement-breakpoint
DROP INDEX `joints_project_state`;--> statement-breakpoint
DROP INDEX `joints_drawing_sort`;--> statement-breakpoint
CREATE INDEX `joints_project_rank` ON `joints` (`project_id`,(case "state" when 'awaiting_fitup' then 0 when 'fitup_rejected' then 1 when 'ready_to_weld' then 2 when 'awaiting_visual' then 3 when 'repair' then 4 when 'awaiting_nde' then 5 when 'accepted' then 6 when 'void' then 7 end),`state_since`);--> statement-breakpoint
CREATE INDEX `joints_project_search` ON `joints` (`project_id`,`drawing_id`,`number`,`line`);--> statement-breakpoint
CREATE INDEX `joints_project_state` ON `joints` (`project_id`,`state`,`state_since`,`id`,`repair_cycle`);--> statement-breakpoint
CREATE INDEX `joints_drawing_sort` ON `joints` (`drawing_id`,`sort_key`,`id`,`number`,`line`);--> statement-breakpoint
CREATE INDEX `inspections_against_verdict` ON `inspections` (`joint_id`) WHERE "against_verdict" = 1;--> statement-breakpoint
-- Written by hand: the counts start from the joints there are, and triggers keep them.
INSERT INTO `joint_state_counts` (`project_id`, `drawing_id`, `state`, `n`)
	SELECT `project_id`, `drawing_id`, `state`, count(*) FROM `joints` GROUP BY `drawing_id`, `state`;--> statement-breakpoint
CREATE TRIGGER `joints_counts_insert` AFTER INSERT ON `joints` BEGIN
	INSERT INTO `joint_state_counts` (`project_id`, `drawing_id`, `state`, `n`)
		VALUES (new.`project_id`, new.`drawing_id`, new.`state`, 1)
		ON CONFLICT (`drawing_id`, `state`) DO UPDATE SET `n` = `n` + 1;
END;--> statement-breakpoint
CREATE TRIGGER `joints_counts_delete` AFTER DELETE ON `joints` BEGIN
	UPDATE `joint_state_counts` SET `n` = `n` - 1
		WHERE `drawing_id` = old.`drawing_id` AND `state` = old.`state`;
	DELETE FROM `joint_state_counts`
		WHERE `drawing_id` = old.`drawing_id` AND `state` = old.`state` AND `n` <= 0;
END;--> statement-breakpoint
CREATE TRIGGER `joints_counts_update` AFTER UPDATE OF `state`, `drawing_id`, `project_id` ON `joints`
	WHEN old.`state` IS NOT new.`state` OR old.`drawing_id` IS NOT new.`drawing_id`
		OR old.`project_id` IS NOT new.`project_id`
BEGIN
	UPDATE `joint_state_counts` SET `n` = `n` - 1
		WHERE `drawing_id` = old.`drawing_id` AND `state` = old.`state`;
	DELETE FROM `joint_state_counts`
		WHERE `drawing_id` = old.`drawing_id` AND `state` = old.`state` AND `n` <= 0;
	INSERT INTO `joint_state_counts` (`project_id`, `drawing_id`, `state`, `n`)
		VALUES (new.`project_id`, new.`drawing_id`, new.`state`, 1)
		ON CONFLICT (`drawing_id`, `state`) DO UPDATE SET `n` = `n` + 1;
END;
