import { PassThrough } from 'node:stream';
import ExcelJS from 'exceljs';
import { and, count, eq, inArray, ne, sql } from 'drizzle-orm';
import { beforeAll, describe, expect, it } from 'vitest';
import { db, schema } from '$lib/server/db';
import { seedIfEmpty } from '$lib/server/demo/seed';
import * as weldLog from '$lib/server/weld-log';
import * as projects from '$lib/server/projects';
import { filled, weldLogFilter, weldLogQuery } from '$lib/schemas/weld-log';
import { JOINT_STATES, displayWeldNumber } from '$lib/joint-state';
import type { WeldLogRow } from '$lib/weld-log';
import { csvNotice, readCsv } from '../fixtures/csv';
import { CAUTION, CAUTION_LEAD } from '$lib/caution';

const j = schema.joints;
const d = schema.drawings;
let lbm: number;

const query = (q: Record<string, string> = {}) => weldLogQuery.parse(filled(q));

async function collect(write: (stream: PassThrough) => Promise<void>): Promise<Buffer> {
	const stream = new PassThrough();
	const chunks: Buffer[] = [];
	stream.on('data', (chunk: Buffer) => chunks.push(chunk));
	await write(stream);
	return Buffer.concat(chunks);
}

/** Direct counts in plain SQL, written apart from the module under test. */
function directCount(filter: {
	state?: string;
	drawing?: number;
	area?: string;
	welder?: string;
	q?: string;
	againstVerdict?: string;
}) {
	const clauses = [sql`j.project_id = ${lbm}`];
	if (filter.state) clauses.push(sql`j.state = ${filter.state}`);
	if (filter.drawing) clauses.push(sql`j.drawing_id = ${filter.drawing}`);
	if (filter.area) clauses.push(sql`dr.area = ${filter.area}`);
	if (filter.welder)
		clauses.push(sql`exists (select 1 from welds w join weld_welders ww on ww.weld_id = w.id
			join welders wl on wl.id = ww.welder_id
			where w.joint_id = j.id and wl.stamp = ${filter.welder})`);
	if (filter.againstVerdict === '1') clauses.push(sql`j.id in (${againstVerdictJoints})`);
	if (filter.q) {
		const p = `%${filter.q}%`;
		clauses.push(sql`(j.number like ${p} or dr.number like ${p} or j.line like ${p})`);
	}
	const row = db.get<{ n: number }>(
		sql`select count(*) as n from joints j join drawings dr on dr.id = j.drawing_id where ${sql.join(clauses, sql` and `)}`
	);
	return row.n;
}

/** Joints with a standing (uncorrected) inspection decided against the verdict. */
const againstVerdictJoints = sql`select i.joint_id from inspections i where i.against_verdict = 1
	and not exists (select 1 from inspections later where later.supersedes_id = i.id)`;

beforeAll(async () => {
	await seedIfEmpty();
	lbm = db.select().from(schema.projects).where(eq(schema.projects.code, 'LBM-20')).get()!.id;
}, 120_000);

describe('weld log filters', () => {
	it('gives every joint of the project by default, as the grouped count does', () => {
		const page = weldLog.list(lbm, query({ pageSize: '500' }));
		const direct = db.select({ n: count() }).from(j).where(eq(j.projectId, lbm)).get()!.n;
		expect(direct).toBeGreaterThan(10);
		expect(page.total).toBe(direct);
		expect(page.items).toHaveLength(direct);
		// The answer's verdicts travel with the caution.
		expect(page.notice).toBe(CAUTION);
	});

	it('agrees with a direct count for each filter and their combinations', () => {
		const drawingRows = db.select().from(d).where(eq(d.projectId, lbm)).all();
		const stamps = db
			.select({ stamp: schema.welders.stamp })
			.from(schema.welders)
			.where(eq(schema.welders.projectId, lbm))
			.all()
			.map((w) => w.stamp);
		const areas = [...new Set(drawingRows.map((row) => row.area))];
		const cases: Record<string, string | number>[] = [
			...JOINT_STATES.map((state) => ({ state })),
			...drawingRows.map((row) => ({ drawing: row.id })),
			...areas.map((area) => ({ area })),
			...stamps.map((welder) => ({ welder })),
			{ q: '1102' },
			{ q: '1' },
			{ q: 'no such thing' },
			{ againstVerdict: '1' },
			{ againstVerdict: '1', area: areas[0] },
			{ state: 'accepted', area: areas[0] },
			{ state: 'awaiting_visual', welder: stamps[0] },
			{ area: areas[0], welder: stamps[1], q: '1' },
			{ drawing: drawingRows[0].id, state: 'accepted' }
		];
		let nonEmpty = 0;
		for (const filter of cases) {
			const strings = Object.fromEntries(Object.entries(filter).map(([k, v]) => [k, String(v)]));
			const page = weldLog.list(lbm, query({ ...strings, pageSize: '500' }));
			const direct = directCount(filter);
			expect(page.total, JSON.stringify(filter)).toBe(direct);
			expect(page.items, JSON.stringify(filter)).toHaveLength(direct);
			if (direct > 0) nonEmpty++;
		}
		expect(nonEmpty).toBeGreaterThan(cases.length / 2);
	});

	// Rule: the welder filter matches any weld of the joint (src/lib/server/weld-log.ts, whereOf).
	it('finds every joint a welder welded, the welds a repair replaced among them', () => {
		const stamps = db
			.select({ stamp: schema.welders.stamp })
			.from(schema.welders)
			.where(eq(schema.welders.projectId, lbm))
			.all()
			.map((w) => w.stamp);
		let byEarlierWeld = 0;
		for (const stamp of stamps) {
			const rows = weldLog.list(lbm, query({ welder: stamp, pageSize: '500' })).items;
			for (const row of rows) {
				const welded = db.get<{ n: number }>(sql`select count(*) as n from welds w
					join weld_welders ww on ww.weld_id = w.id join welders wl on wl.id = ww.welder_id
					where w.joint_id = ${row.id} and wl.stamp = ${stamp}`).n;
				expect(welded, `${stamp} on ${row.weldNumber}`).toBeGreaterThan(0);
				// The row shows the latest weld's stamps; an earlier weld is how it matched.
				if (![...row.rootWelders, ...row.fillCapWelders].includes(stamp)) byEarlierWeld++;
			}
		}
		// The demo job has repairs welded by another hand than the first weld.
		expect(byEarlierWeld).toBeGreaterThan(0);
	});

	// Rule: a decision against the verdict is flagged wherever the record shows; the flag is
	// set when the inspection is recorded (src/lib/server/inspections.ts, record).
	it('flags the joints decided against the verdict, and filters on them', () => {
		const flagged = new Set(
			db
				.all<{ id: number }>(
					sql`select distinct joint_id as id from (${againstVerdictJoints})
				where joint_id in (select id from joints where project_id = ${lbm})`
				)
				.map((r) => r.id)
		);
		expect(flagged.size).toBeGreaterThan(0);
		const all = weldLog.list(lbm, query({ pageSize: '500' })).items;
		for (const row of all) expect(row.againstVerdict, row.weldNumber).toBe(flagged.has(row.id));
		const only = weldLog.list(lbm, query({ againstVerdict: '1', pageSize: '500' }));
		expect(new Set(only.items.map((row) => row.id))).toEqual(flagged);
		const column = weldLog.COLUMNS.find((c) => c.id === 'againstVerdict')!;
		expect(column.header).toBe('Against verdict');
		expect(only.items.map((row) => column.value(row))).toEqual(only.items.map(() => 'Yes'));
		expect(weldLogQuery.safeParse({ againstVerdict: 'maybe' }).success).toBe(false);
	});

	it('reads the current revision, the repair suffix and the latest results', () => {
		const rows = weldLog.list(lbm, query({ pageSize: '500' })).items;
		for (const row of rows) {
			const current = db
				.select({ label: schema.revisions.label })
				.from(schema.revisions)
				.where(
					and(eq(schema.revisions.drawingId, row.drawingId), eq(schema.revisions.status, 'current'))
				)
				.get();
			expect(row.revision).toBe(current?.label ?? null);
			expect(row.weldNumber).toBe(displayWeldNumber(row.number, row.repairCount));
			if (row.state === 'accepted') expect(row.visualResult).toBe('accept');
			if (row.state === 'ready_to_weld') expect(row.fitupResult).toBe('accept');
			if (row.state === 'awaiting_fitup') expect(row.fitupResult).toBeNull();
		}
		expect(rows.some((row) => row.weldedOn && row.rootWelders.length > 0)).toBe(true);
	});
});

describe('weld log order and pages', () => {
	it('sorts by drawing and weld number by default, and by state, age and weld date', () => {
		const all = weldLog.list(lbm, query({ pageSize: '500' })).items;
		const key = (row: WeldLogRow) => [row.drawing, String(row.id)];
		for (let n = 1; n < all.length; n++)
			expect(all[n - 1].drawing <= all[n].drawing, key(all[n]).join()).toBe(true);
		const age = weldLog.list(lbm, query({ sort: 'age', pageSize: '500' })).items;
		for (let n = 1; n < age.length; n++)
			expect(age[n - 1].stateSince).toBeLessThanOrEqual(age[n].stateSince);
		const ageDesc = weldLog.list(lbm, query({ sort: 'age', dir: 'desc', pageSize: '500' })).items;
		expect(ageDesc.map((row) => row.id)).toEqual([...age].reverse().map((row) => row.id));
		// By state in the order the work runs (JOINT_STATES, src/lib/joint-state.ts), not by name;
		// within a state, longest waiting first.
		const state = weldLog.list(lbm, query({ sort: 'state', pageSize: '500' })).items;
		const rank = (row: WeldLogRow) => JOINT_STATES.indexOf(row.state);
		for (let n = 1; n < state.length; n++) {
			expect(rank(state[n - 1])).toBeLessThanOrEqual(rank(state[n]));
			if (rank(state[n - 1]) === rank(state[n]))
				expect(state[n - 1].stateSince).toBeLessThanOrEqual(state[n].stateSince);
		}
		expect(new Set(state.map((row) => row.state)).size).toBeGreaterThan(3);
		expect(state[0].state).toBe('awaiting_fitup');
		const stateDesc = weldLog.list(
			lbm,
			query({ sort: 'state', dir: 'desc', pageSize: '500' })
		).items;
		expect(stateDesc.map((row) => row.id)).toEqual([...state].reverse().map((row) => row.id));
		const welded = weldLog.list(
			lbm,
			query({ sort: 'weldedOn', dir: 'desc', pageSize: '500' })
		).items;
		const dates = welded.map((row) => row.weldedOn).filter((v) => v !== null);
		expect(dates).toEqual([...dates].sort().reverse());
	});

	it('pages without losing or repeating a row, and gives an empty page past the end', () => {
		const all = weldLog.list(lbm, query({ pageSize: '500' }));
		const seen: number[] = [];
		for (let page = 1; page <= Math.ceil(all.total / 7); page++)
			seen.push(
				...weldLog.list(lbm, query({ pageSize: '7', page: String(page) })).items.map((r) => r.id)
			);
		expect(seen).toEqual(all.items.map((row) => row.id));
		const past = weldLog.list(lbm, query({ pageSize: '7', page: '999' }));
		expect(past.items).toEqual([]);
		expect(past.total).toBe(all.total);
	});

	it('refuses a page size over 500 and bad values, naming the field', () => {
		for (const [field, value] of [
			['pageSize', '501'],
			['pageSize', '0'],
			['page', '0'],
			['state', 'finished'],
			['sort', 'colour'],
			['dir', 'up'],
			['drawing', 'x']
		]) {
			const result = weldLogQuery.safeParse({ [field]: value });
			expect(result.success, `${field}=${value}`).toBe(false);
			expect(result.error?.issues[0].path).toEqual([field]);
		}
		expect(weldLogQuery.parse(filled({ state: '', pageSize: '500' })).pageSize).toBe(500);
	});
});

describe('weld log files', () => {
	const filter = () => weldLogFilter.parse({ area: 'Area 20' });

	it('writes a CSV that a reader opens, holding exactly the filtered rows', async () => {
		const expected = [...weldLog.iterate(lbm, filter())];
		expect(expected.length).toBe(directCount({ area: 'Area 20' }));
		const bytes = await collect((s) => weldLog.writeCsv(weldLog.iterate(lbm, filter()), s));
		const records = readCsv(bytes.toString('utf8'));
		expect(csvNotice(bytes.toString('utf8'))).toBe(`Notice: ${CAUTION}`);
		expect(records[0]).toEqual(weldLog.COLUMNS.map((c) => c.header));
		expect(records.slice(1)).toEqual(
			expected.map((row) => weldLog.COLUMNS.map((c) => String(c.value(row))))
		);
		// The same file read by a spreadsheet library.
		const workbook = new ExcelJS.Workbook();
		const stream = new PassThrough();
		stream.end(bytes.toString('utf8').replace(/^\uFEFF/, ''));
		const sheet = await workbook.csv.read(stream);
		// The caution's line, the header, the rows.
		expect(sheet.actualRowCount).toBe(expected.length + 2);
		expect(sheet.getRow(1).getCell(1).value).toBe(`Notice: ${CAUTION}`);
	});

	it('writes an Excel workbook that opens, holding exactly the filtered rows', async () => {
		const expected = [...weldLog.iterate(lbm, filter())];
		const bytes = await collect((s) => weldLog.writeXlsx(weldLog.iterate(lbm, filter()), s));
		const workbook = new ExcelJS.Workbook();
		await workbook.xlsx.load(bytes as unknown as ArrayBuffer);
		const sheet = workbook.getWorksheet('Weld log')!;
		expect(sheet.actualRowCount).toBe(expected.length + 1);
		const header = (sheet.getRow(1).values as unknown[]).slice(1);
		expect(header).toEqual(weldLog.COLUMNS.map((c) => c.header));
		// The header stays in view and carries filter buttons over every row.
		expect(sheet.views[0]).toMatchObject({ state: 'frozen', ySplit: 1 });
		expect(sheet.autoFilter).toBe(
			`A1:${sheet.getColumn(weldLog.COLUMNS.length).letter}${expected.length + 1}`
		);
		expect(sheet.getColumn(1).width).toBe(18);
		// A notes sheet carries the caution, and printed pages have it in their footer.
		expect(workbook.getWorksheet('Notes')!.getRow(2).getCell(1).value).toBe(CAUTION);
		expect(sheet.headerFooter.oddFooter).toContain(CAUTION_LEAD);
		expected.forEach((row, n) => {
			const values = (sheet.getRow(n + 2).values as unknown[]).slice(1);
			const wanted = weldLog.COLUMNS.map((c) => c.value(row));
			// Empty cells come back as missing; compare them as empty text.
			expect(wanted.map((_, k) => values[k] ?? '')).toEqual(wanted);
		});
	});

	it('stops a workbook whose reader went away, instead of waiting for ever', async () => {
		// Plant-sized: enough rows that the zip inside the workbook has to wait for its reader.
		const [sample] = weldLog.iterate(lbm, filter());
		function* many() {
			for (let n = 0; n < 30_000; n++) yield { ...sample, weldNumber: String(n) };
		}
		const reader = new PassThrough();
		let read = 0;
		reader.on('data', (chunk: Buffer) => {
			read += chunk.length;
			if (read > 100_000) reader.destroy();
		});
		await expect(weldLog.writeXlsx(many(), reader)).rejects.toThrow('The download was cancelled.');
	}, 60_000);

	it('names the file safely', () => {
		const at = new Date(Date.UTC(2026, 11, 2));
		expect(weldLog.fileName('LBM-20', 'csv', at)).toBe('LBM-20-weld-log-2026-12-02.csv');
		expect(weldLog.fileName('A/B "C"', 'xlsx', at)).toBe('A-B-C-weld-log-2026-12-02.xlsx');
	});
});

describe('summary and progress', () => {
	it('counts by state, area and drawing as a plain grouped count does', () => {
		const summary = weldLog.summary(lbm, { drawings: true });
		expect(weldLog.summary(lbm)).not.toHaveProperty('byDrawing');
		expect(summary.counts).toEqual(projects.stateCounts([lbm]).get(lbm));
		const areas = projects.stateCountsByArea(lbm);
		expect(summary.byArea).toEqual(areas);
		expect(summary.byDrawing?.length).toBeGreaterThan(0);
		for (const drawing of summary.byDrawing ?? []) {
			for (const state of JOINT_STATES) {
				const n = db
					.select({ n: count() })
					.from(j)
					.where(and(eq(j.drawingId, drawing.id), eq(j.state, state)))
					.get()!.n;
				expect(drawing.counts[state]).toBe(n);
			}
		}
	});

	it('ends the cumulative line at the accepted count, against the live joints', () => {
		for (const area of [undefined, 'Area 20', 'no such area']) {
			const progress = weldLog.progress(lbm, area);
			const scope = and(
				eq(j.projectId, lbm),
				area ? sql`${j.drawingId} in (select id from drawings where area = ${area})` : undefined
			);
			const accepted = db
				.select({ n: count() })
				.from(j)
				// Accepted on its own records, or by its NDE lot's sample (ASME B31.3 341.3.4(b)).
				.where(and(scope, inArray(j.state, ['accepted', 'accepted_by_lot'])))
				.get()!.n;
			const live = db
				.select({ n: count() })
				.from(j)
				.where(and(scope, ne(j.state, 'void')))
				.get()!.n;
			expect(progress.total).toBe(live);
			expect(progress.accepted).toBe(accepted);
			expect(progress.days.at(-1)?.cumulative ?? 0).toBe(accepted);
			expect(progress.days.reduce((sum, day) => sum + day.accepted, 0)).toBe(accepted);
		}
		expect(weldLog.progress(lbm).accepted).toBeGreaterThan(0);
	});
});
