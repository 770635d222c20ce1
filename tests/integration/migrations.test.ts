import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { migrate, open } from '$lib/server/db';

describe('migrations', () => {
	it('create every table with foreign keys on, WAL and NORMAL synchronous', () => {
		const file = path.join(fs.mkdtempSync(path.join(os.tmpdir(), 'tacksheet-mig-')), 'm.db');
		const db = open(file);
		migrate(db);
		const client = db.$client;
		const tables = (
			client.prepare("select name from sqlite_master where type = 'table'").all() as {
				name: string;
			}[]
		).map((t) => t.name);
		for (const table of [
			'users',
			'projects',
			'memberships',
			'drawings',
			'revisions',
			'pages',
			'joints',
			'pins',
			'welds',
			'welders',
			'inspections',
			'inspection_requests',
			'nde_selections',
			'exports',
			'audit_events',
			'joint_state_counts'
		]) {
			expect(tables).toContain(table);
		}
		// The state counts are kept by triggers; a rebuild of `joints` would drop them.
		const triggers = client
			.prepare("select name from sqlite_master where type = 'trigger' and tbl_name = 'joints'")
			.all() as { name: string }[];
		expect(triggers.map((t) => t.name).sort()).toEqual([
			'joints_counts_delete',
			'joints_counts_insert',
			'joints_counts_update'
		]);
		expect(client.pragma('journal_mode', { simple: true })).toBe('wal');
		// 1 = NORMAL (https://www.sqlite.org/pragma.html#pragma_synchronous)
		expect(client.pragma('synchronous', { simple: true })).toBe(1);
		expect(client.pragma('foreign_keys', { simple: true })).toBe(1);
		expect(client.pragma('busy_timeout', { simple: true })).toBe(5000);
		// Running again applies nothing and loses nothing.
		client.exec("insert into projects (code, name) values ('X-1', 'Kept')");
		migrate(db);
		expect(client.prepare('select count(*) as n from projects').get()).toEqual({ n: 1 });
		client.close();
	});
});
