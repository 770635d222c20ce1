/**
 * The outstanding board: how many joints stand in each state by area, system and drawing,
 * and what each role owes, oldest first. Counted and ordered in SQL on the joints' cached
 * state (index joints_project_state: project, state, state_since), capped per list.
 */
import { and, asc, count, desc, eq, isNull, sql, type SQL } from 'drizzle-orm';
import { db, schema } from './db';
import * as counting from './state-counts';
import { displayWeldNumber, JOINT_STATES, type JointState } from '$lib/joint-state';
import { OWED_STATES, type OwingRole } from '$lib/outstanding';
import type { OutstandingQuery } from '$lib/schemas/outstanding';

const j = schema.joints;
const d = schema.drawings;
const r = schema.inspectionRequests;

/** At most this many drawings in the count table; the areas and systems still total all. */
const DRAWING_ROWS = 300;

function filters(projectId: number, query: OutstandingQuery): SQL[] {
	const where: SQL[] = [eq(j.projectId, projectId)];
	if (query.area !== undefined) where.push(eq(d.area, query.area));
	if (query.drawing !== undefined) where.push(eq(j.drawingId, query.drawing));
	if (query.welder !== undefined) {
		where.push(
			sql`exists (select 1 from ${schema.welds} w join ${schema.weldWelders} ww on ww.weld_id = w.id where w.joint_id = ${j.id} and ww.welder_id = ${query.welder})`
		);
	}
	return where;
}

type Counts = Partial<Record<JointState, number>>;

function add(into: Counts, state: JointState, n: number) {
	into[state] = (into[state] ?? 0) + n;
}

type CountRow = {
	area: string;
	system: string;
	drawingId: number;
	drawingNumber: string;
	state: JointState;
	n: number;
};
type DrawingCounts = {
	drawingId: number;
	number: string;
	area: string;
	system: string;
	counts: Counts;
};

const OWED = [...OWED_STATES.foreman, ...OWED_STATES.inspector];
const owedOf = (c: Counts) => OWED.reduce((n, s) => n + (c[s] ?? 0), 0);

/** Totals, areas and systems from rows of (area, system, state, n). */
function rollUp(rows: Omit<CountRow, 'drawingId' | 'drawingNumber'>[]) {
	const total: Counts = {};
	const areas = new Map<string, Counts>();
	const systems = new Map<string, { area: string; system: string; counts: Counts }>();
	for (const row of rows) {
		add(total, row.state, row.n);
		if (!areas.has(row.area)) areas.set(row.area, {});
		add(areas.get(row.area)!, row.state, row.n);
		const key = `${row.area}\u0000${row.system}`;
		if (!systems.has(key)) systems.set(key, { area: row.area, system: row.system, counts: {} });
		add(systems.get(key)!.counts, row.state, row.n);
	}
	return {
		total,
		byArea: [...areas.entries()]
			.map(([area, counts]) => ({ area, counts }))
			.sort((a, b) => a.area.localeCompare(b.area)),
		bySystem: [...systems.values()].sort(
			(a, b) => a.area.localeCompare(b.area) || a.system.localeCompare(b.system)
		)
	};
}

/** Rows of (drawing, state, n) folded into one entry per drawing, in first-seen order. */
function perDrawing(rows: CountRow[]): Map<number, DrawingCounts> {
	const drawings = new Map<number, DrawingCounts>();
	for (const row of rows) {
		if (!drawings.has(row.drawingId)) {
			drawings.set(row.drawingId, {
				drawingId: row.drawingId,
				number: row.drawingNumber,
				area: row.area,
				system: row.system,
				counts: {}
			});
		}
		add(drawings.get(row.drawingId)!.counts, row.state, row.n);
	}
	return drawings;
}

/**
 * From the counts the triggers keep: areas and systems from area_state_counts, and the
 * drawings owing most from drawing_state_counts (one row per drawing), so 5,000 drawings
 * cost one pass over 5,000 small rows.
 */
function keptCounts(projectId: number, query: OutstandingQuery) {
	const p = schema.drawingStateCounts;
	const where = and(
		eq(p.projectId, projectId),
		query.area !== undefined ? eq(d.area, query.area) : undefined,
		query.drawing !== undefined ? eq(p.drawingId, query.drawing) : undefined
	);
	const owedSum = sql.join(
		OWED.map((state) => sql`coalesce(${p.counts} ->> ${state}, 0)`),
		sql` + `
	);
	const top = db
		.select({ drawingId: d.id, number: d.number, area: d.area, system: d.system, counts: p.counts })
		.from(p)
		.innerJoin(d, eq(d.id, p.drawingId))
		.where(where)
		.orderBy(desc(owedSum), asc(d.number))
		.limit(DRAWING_ROWS)
		.all();
	const drawingsTotal =
		db.select({ n: count() }).from(p).innerJoin(d, eq(d.id, p.drawingId)).where(where).get()?.n ??
		0;
	// Areas and systems from their own kept counts; one drawing's from its own row.
	const systemRows =
		query.drawing === undefined
			? counting.byAreaAndSystem(projectId, query.area)
			: top.flatMap((row) =>
					(Object.entries(row.counts) as [JointState, number][]).map(([state, n]) => ({
						area: row.area,
						system: row.system,
						state,
						n
					}))
				);
	return {
		...rollUp(systemRows),
		byDrawing: top.map((row) => ({
			drawingId: row.drawingId,
			number: row.number,
			area: row.area,
			system: row.system,
			counts: { ...row.counts } as Counts
		})),
		drawingsTotal
	};
}

/** With a welder asked for, only the joints themselves can answer: grouped from them. */
function welderCounts(projectId: number, query: OutstandingQuery) {
	const rows: CountRow[] = db
		.select({
			area: d.area,
			system: d.system,
			drawingId: d.id,
			drawingNumber: d.number,
			state: j.state,
			n: count()
		})
		.from(j)
		.innerJoin(d, eq(d.id, j.drawingId))
		.where(and(...filters(projectId, query)))
		.groupBy(d.area, d.system, d.id, j.state)
		.all();
	// Thousands of drawings at most: a plain comparison of their numbers, not a locale one.
	const byDrawing = [...perDrawing(rows).values()]
		.map((drawing) => ({ drawing, owed: owedOf(drawing.counts) }))
		.sort(
			(a, b) =>
				b.owed - a.owed ||
				(a.drawing.number < b.drawing.number ? -1 : a.drawing.number > b.drawing.number ? 1 : 0)
		)
		.map(({ drawing }) => drawing);
	return {
		...rollUp(rows),
		byDrawing: byDrawing.slice(0, DRAWING_ROWS),
		drawingsTotal: byDrawing.length
	};
}

/** Joint counts by state, per area, per area and system, and per drawing (those owing most). */
export function counts(projectId: number, query: OutstandingQuery) {
	return query.welder === undefined ? keptCounts(projectId, query) : welderCounts(projectId, query);
}

/**
 * One state's joints, oldest in that state first, with the sheet page of the current pin;
 * `offset` skips that many, for "show more".
 */
export function owedList(
	projectId: number,
	state: JointState,
	query: OutstandingQuery,
	knownTotal?: number
) {
	const where = and(...filters(projectId, query), eq(j.state, state));
	const items = db
		.select({
			jointId: j.id,
			number: j.number,
			repairCycle: j.repairCycle,
			kind: j.kind,
			location: j.location,
			state: j.state,
			stateSince: j.stateSince,
			version: j.version,
			drawingId: d.id,
			drawingNumber: d.number,
			area: d.area,
			system: d.system,
			pageIndex: sql<
				number | null
			>`(select p.page_index from ${schema.pins} p join ${schema.revisions} rv on rv.id = p.revision_id where p.joint_id = ${j.id} and rv.status = 'current' limit 1)`,
			requestId: sql<
				number | null
			>`(select ir.id from ${r} ir where ir.joint_id = ${j.id} and ir.closed_at is null order by ir.requested_at limit 1)`,
			requestedAt: sql<
				number | null
			>`(select min(ir.requested_at) from ${r} ir where ir.joint_id = ${j.id} and ir.closed_at is null)`
		})
		.from(j)
		.innerJoin(d, eq(d.id, j.drawingId))
		.where(where)
		.orderBy(asc(j.stateSince), asc(j.id))
		.limit(query.limit)
		.offset(query.offset)
		.all();
	const total = knownTotal ?? stateTotal(projectId, state, query);
	return {
		state,
		total,
		offset: query.offset,
		items: items.map((item) => ({
			...item,
			label: displayWeldNumber(item.number, item.repairCycle),
			page: item.pageIndex === null ? null : item.pageIndex + 1,
			href: `/projects/${projectId}/drawings/${item.drawingId}?${new URLSearchParams({
				...(item.pageIndex === null ? {} : { page: String(item.pageIndex + 1) }),
				weld: item.number
			})}`
		}))
	};
}

/** How many joints stand in a state: from the kept counts unless a welder is asked for. */
function stateTotal(projectId: number, state: JointState, query: OutstandingQuery): number {
	if (query.welder !== undefined) {
		const where = and(...filters(projectId, query), eq(j.state, state));
		return (
			db.select({ n: count() }).from(j).innerJoin(d, eq(d.id, j.drawingId)).where(where).get()?.n ??
			0
		);
	}
	const c = schema.jointStateCounts;
	return (
		db
			.select({ n: sql<number>`coalesce(sum(${c.n}), 0)` })
			.from(c)
			.innerJoin(d, eq(d.id, c.drawingId))
			.where(
				and(
					eq(c.projectId, projectId),
					eq(c.state, state),
					query.area !== undefined ? eq(d.area, query.area) : undefined,
					query.drawing !== undefined ? eq(c.drawingId, query.drawing) : undefined
				)
			)
			.get()?.n ?? 0
	);
}

/**
 * What each role owes, state by state; `totals` (the board's counts, same filters) saves
 * counting each state again.
 */
export function owed(projectId: number, query: OutstandingQuery, totals?: Counts) {
	const roles = Object.keys(OWED_STATES) as OwingRole[];
	return Object.fromEntries(
		roles.map((role) => [
			role,
			OWED_STATES[role].map((s) =>
				owedList(projectId, s, { ...query, offset: 0 }, totals ? (totals[s] ?? 0) : undefined)
			)
		])
	) as Record<OwingRole, ReturnType<typeof owedList>[]>;
}

/** The choices of the board's filters: areas, and welders who have stamped a weld here. */
export function filterOptions(projectId: number) {
	const areas = db
		.selectDistinct({ area: d.area })
		.from(d)
		.where(eq(d.projectId, projectId))
		.orderBy(asc(d.area))
		.all()
		.map((a) => a.area);
	const welders = db
		.select({ id: schema.welders.id, stamp: schema.welders.stamp, name: schema.welders.name })
		.from(schema.welders)
		.where(eq(schema.welders.projectId, projectId))
		.orderBy(asc(schema.welders.stamp))
		.all();
	return { areas, welders };
}

/** Requests closed lately, with how long each waited for its inspection. */
export function recentlyClosed(projectId: number, limit = 20) {
	return db
		.select({
			id: r.id,
			batch: r.batch,
			stage: r.stage,
			jointId: r.jointId,
			number: j.number,
			drawingNumber: d.number,
			requestedAt: r.requestedAt,
			closedAt: r.closedAt
		})
		.from(r)
		.innerJoin(j, eq(j.id, r.jointId))
		.innerJoin(d, eq(d.id, j.drawingId))
		.where(and(eq(r.projectId, projectId), sql`${r.closedAt} is not null`))
		.orderBy(desc(r.closedAt))
		.limit(limit)
		.all()
		.map((row) => ({ ...row, waitedMs: (row.closedAt ?? row.requestedAt) - row.requestedAt }));
}

/** The whole board, as GET /api/projects/{id}/outstanding answers it. */
export function board(projectId: number, query: OutstandingQuery) {
	const counted = counts(projectId, query);
	return {
		now: Date.now(),
		states: JOINT_STATES,
		counts: counted,
		owed: owed(projectId, query, counted.total),
		openRequests:
			db
				.select({ n: count() })
				.from(r)
				.where(and(eq(r.projectId, projectId), isNull(r.closedAt)))
				.get()?.n ?? 0,
		recentlyClosed: recentlyClosed(projectId),
		filters: filterOptions(projectId)
	};
}

export type Board = ReturnType<typeof board>;
