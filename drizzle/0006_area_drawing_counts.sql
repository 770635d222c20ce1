CREATE TABLE `area_state_counts` (
	`project_id` integer NOT NULL,
	`area` text NOT NULL,
	`system` text NOT NULL,
	`state` text NOT NULL,
	`n` integer NOT NULL,
	PRIMARY KEY(`project_id`, `area`, `system`, `state`),
	FOREIGN KEY (`project_id`) REFERENCES `projects`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE TABLE `drawing_state_counts` (
	`drawing_id` integer PRIMARY KEY NOT NULL,
	`project_id` integer NOT NULL,
	`counts` text NOT NULL,
	FOREIGN KEY (`drawing_id`) REFERENCES `drawings`(`id`) ON UPDATE no action ON DELETE cascade,
	FOREIGN KEY (`project_id`) REFERENCES `projects`(`id`) ON UPDATE no action ON DELETE cascade
);
--> statement-breakpoint
CREATE INDEX `drawing_state_counts_project` ON `drawing_state_counts` (`project_id`,`drawing_id`);--> statement-breakpoint
-- Written by hand: the area/system counts and the per-drawing JSON counts start from the
-- per-drawing state counts there are (joint_state_counts, kept by the triggers of 0002), and
-- triggers on joint_state_counts and drawings keep them in the same transaction as a change.
-- None is on `joints`, so a migration that rebuilds `joints` leaves these in place.
INSERT INTO `area_state_counts` (`project_id`, `area`, `system`, `state`, `n`)
	SELECT c.`project_id`, d.`area`, d.`system`, c.`state`, sum(c.`n`)
	FROM `joint_state_counts` c JOIN `drawings` d ON d.`id` = c.`drawing_id`
	GROUP BY c.`project_id`, d.`area`, d.`system`, c.`state`;--> statement-breakpoint
INSERT INTO `drawing_state_counts` (`drawing_id`, `project_id`, `counts`)
	SELECT `drawing_id`, max(`project_id`), json_group_object(`state`, `n`)
	FROM `joint_state_counts` GROUP BY `drawing_id`;--> statement-breakpoint
CREATE TRIGGER `state_counts_kept_insert` AFTER INSERT ON `joint_state_counts` BEGIN
	INSERT INTO `area_state_counts` (`project_id`, `area`, `system`, `state`, `n`)
		SELECT new.`project_id`, d.`area`, d.`system`, new.`state`, new.`n`
		FROM `drawings` d WHERE d.`id` = new.`drawing_id`
		ON CONFLICT (`project_id`, `area`, `system`, `state`) DO UPDATE SET `n` = `n` + excluded.`n`;
	INSERT INTO `drawing_state_counts` (`drawing_id`, `project_id`, `counts`)
		VALUES (new.`drawing_id`, new.`project_id`, json_object(new.`state`, new.`n`))
		ON CONFLICT (`drawing_id`) DO UPDATE
		SET `counts` = json_set(`counts`, '$."' || new.`state` || '"', new.`n`);
END;--> statement-breakpoint
CREATE TRIGGER `state_counts_kept_update` AFTER UPDATE ON `joint_state_counts` BEGIN
	UPDATE `area_state_counts` SET `n` = `n` - old.`n`
		WHERE (`project_id`, `area`, `system`, `state`) = (
			SELECT old.`project_id`, d.`area`, d.`system`, old.`state`
			FROM `drawings` d WHERE d.`id` = old.`drawing_id`);
	INSERT INTO `area_state_counts` (`project_id`, `area`, `system`, `state`, `n`)
		SELECT new.`project_id`, d.`area`, d.`system`, new.`state`, new.`n`
		FROM `drawings` d WHERE d.`id` = new.`drawing_id`
		ON CONFLICT (`project_id`, `area`, `system`, `state`) DO UPDATE SET `n` = `n` + excluded.`n`;
	DELETE FROM `area_state_counts`
		WHERE `project_id` IN (old.`project_id`, new.`project_id`) AND `n` <= 0;
	UPDATE `drawing_state_counts`
		SET `counts` = json_remove(`counts`, '$."' || old.`state` || '"')
		WHERE `drawing_id` = old.`drawing_id`;
	INSERT INTO `drawing_state_counts` (`drawing_id`, `project_id`, `counts`)
		VALUES (new.`drawing_id`, new.`project_id`, json_object(new.`state`, new.`n`))
		ON CONFLICT (`drawing_id`) DO UPDATE
		SET `counts` = json_set(`counts`, '$."' || new.`state` || '"', new.`n`);
	DELETE FROM `drawing_state_counts` WHERE `drawing_id` = old.`drawing_id` AND `counts` = '{}';
END;--> statement-breakpoint
CREATE TRIGGER `state_counts_kept_delete` AFTER DELETE ON `joint_state_counts` BEGIN
	UPDATE `area_state_counts` SET `n` = `n` - old.`n`
		WHERE (`project_id`, `area`, `system`, `state`) = (
			SELECT old.`project_id`, d.`area`, d.`system`, old.`state`
			FROM `drawings` d WHERE d.`id` = old.`drawing_id`);
	DELETE FROM `area_state_counts` WHERE `project_id` = old.`project_id` AND `n` <= 0;
	UPDATE `drawing_state_counts`
		SET `counts` = json_remove(`counts`, '$."' || old.`state` || '"')
		WHERE `drawing_id` = old.`drawing_id`;
	DELETE FROM `drawing_state_counts` WHERE `drawing_id` = old.`drawing_id` AND `counts` = '{}';
END;--> statement-breakpoint
-- A drawing moved to another area or system takes its counts along.
CREATE TRIGGER `drawings_area_counts_update` AFTER UPDATE OF `area`, `system`, `project_id` ON `drawings`
	WHEN old.`area` IS NOT new.`area` OR old.`system` IS NOT new.`system`
		OR old.`project_id` IS NOT new.`project_id`
BEGIN
	UPDATE `area_state_counts` SET `n` = `n` - coalesce((
			SELECT c.`n` FROM `joint_state_counts` c
			WHERE c.`drawing_id` = new.`id` AND c.`state` = `area_state_counts`.`state`
				AND c.`project_id` = `area_state_counts`.`project_id`), 0)
		WHERE `area` = old.`area` AND `system` = old.`system` AND `project_id` IN (
			SELECT c.`project_id` FROM `joint_state_counts` c WHERE c.`drawing_id` = new.`id`);
	INSERT INTO `area_state_counts` (`project_id`, `area`, `system`, `state`, `n`)
		SELECT c.`project_id`, new.`area`, new.`system`, c.`state`, c.`n`
		FROM `joint_state_counts` c WHERE c.`drawing_id` = new.`id`
		ON CONFLICT (`project_id`, `area`, `system`, `state`) DO UPDATE SET `n` = `n` + excluded.`n`;
	DELETE FROM `area_state_counts` WHERE `n` <= 0 AND `project_id` IN (
		SELECT c.`project_id` FROM `joint_state_counts` c WHERE c.`drawing_id` = new.`id`);
END;--> statement-breakpoint
-- A drawing about to be deleted gives up its counts while its area is still known (the
-- joints' own delete triggers then find no count left to change).
CREATE TRIGGER `drawings_counts_delete` BEFORE DELETE ON `drawings` BEGIN
	DELETE FROM `joint_state_counts` WHERE `drawing_id` = old.`id`;
END;
