ALTER TABLE `welders` ADD `stamp_key` text DEFAULT '' NOT NULL;--> statement-breakpoint
-- Hand-written: fill the key of the welders already registered before the unique index asks
-- for it. SQLite's upper() folds ASCII letters only; stamps are letters and digits, and a new
-- or edited welder gets the full key (NFKC, every script upper-cased) from the app.
UPDATE `welders` SET `stamp_key` = upper(trim(`stamp`));--> statement-breakpoint
CREATE UNIQUE INDEX `welders_project_stamp_key` ON `welders` (`project_id`,`stamp_key`);
