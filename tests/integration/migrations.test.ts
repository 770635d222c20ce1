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
			'joint_state_counts',
			'area_state_counts',
			'drawing_state_counts'
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
		// The area/system and per-drawing counts follow joint_state_counts and drawings.
		const kept = client
			.prepare(
				"select name from sqlite_master where type = 'trigger' and tbl_name in ('joint_state_counts', 'drawings')"
			)
			.all() as { name: string }[];
		expect(kept.map((t) => t.name).sort()).toEqual([
			'drawings_area_counts_update',
			'drawings_counts_delete',
			'state_counts_kept_delete',
			'state_counts_kept_insert',
			'state_counts_kept_update'
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

	it('start the area/system and per-drawing counts from the joints already there', () => {
		// The migrations before the kept area counts, then joints, then the rest.
		const root = fs.mkdtempSync(path.join(os.tmpdir(), 'tacksheet-mig-'));
		const before = path.join(root, 'drizzle');
		fs.cpSync('drizzle', before, { recursive: true });
		const journal = JSON.parse(fs.readFileSync(path.join(before, 'meta/_journal.json'), 'utf8'));
		const at = journal.entries.findIndex(
			(e: { tag: string }) => e.tag === '0006_area_drawing_counts'
		);
		expect(at).toBeGreaterThan(0);
		journal.entries = journal.entries.slice(0, at);
		fs.writeFileSync(path.join(before, 'meta/_journal.json'), JSON.stringify(journal));
		const db = open(path.join(root, 'm.db'));
		migrate(db, before);
		const client = db.$client;
		client.exec(`insert into projects (id, code, name) values (1, 'B-1', 'Backfill');
			insert into drawings (id, project_id, number, kind, area, system) values
				(1, 1, 'ISO-1', 'isometric', 'A', 'S1'), (2, 1, 'ISO-2', 'isometric', 'A', 'S2'),
				(3, 1, 'ISO-3', 'isometric', 'B', 'S1');`);
		const joint = client.prepare(
			`insert into joints (project_id, drawing_id, number, sort_key, kind, criteria_set_id, state)
			 values (1, ?, ?, ?, 'butt', 'asme-b31.3-normal', ?)`
		);
		const states = ['awaiting_fitup', 'accepted', 'repair', 'accepted', 'void'];
		for (let n = 0; n < 30; n++)
			joint.run((n % 3) + 1, `${n}`, `${n}`.padStart(8, '0'), states[n % 5]);
		migrate(db);
		const kept = client
			.prepare('select area, system, state, n from area_state_counts order by 1, 2, 3')
			.all();
		const direct = client
			.prepare(
				`select d.area, d.system, j.state, count(*) as n from joints j
				 join drawings d on d.id = j.drawing_id group by 1, 2, 3 order by 1, 2, 3`
			)
			.all();
		expect(kept).toEqual(direct);
		const pivot = client
			.prepare('select drawing_id as id, counts from drawing_state_counts order by 1')
			.all() as { id: number; counts: string }[];
		expect(pivot.map((row) => row.id)).toEqual([1, 2, 3]);
		for (const row of pivot) {
			const counts = client
				.prepare('select state, count(*) as n from joints where drawing_id = ? group by state')
				.all(row.id) as { state: string; n: number }[];
			expect(JSON.parse(row.counts)).toEqual(Object.fromEntries(counts.map((c) => [c.state, c.n])));
		}
		client.close();
	});
});
