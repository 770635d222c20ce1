/**
 * The project's WPS register: every procedure by number and revision, its processes, the
 * ranges it qualifies and its joint design. The QC manager (`wps.manage`) adds and changes
 * them; every change is audited before → after. An approved WPS is linked to the joints whose
 * WPS was typed as its number before the register knew it.
 */
import { and, asc, eq, isNull, ne, sql } from 'drizzle-orm';
import { db, schema, type Db } from './db';
import * as audit from './audit';
import * as projects from './projects';
import { DomainError } from './errors';
import {
	readWps,
	typedOf,
	wpsLabel,
	WPS_FIELD_LABELS,
	type WpsField,
	type WpsRecord,
	type WpsTyped
} from '$lib/wps-register';
import type { WpsRow } from './db/schema';
import { readWpsCsv, type WpsCsvProblem } from '$lib/wps-csv';

type Tx = Parameters<Parameters<Db['transaction']>[0]>[0];
type Reader = Pick<Db, 'select'>;

const w = schema.wps;

export function recordOf(row: WpsRow): WpsRecord {
	return {
		number: row.number,
		revision: row.revision,
		status: row.status,
		title: row.title,
		processes: row.processes,
		materialGroups: row.materialGroups,
		ranges: row.ranges,
		grooveType: row.grooveType,
		preheatMin: row.preheatMin ?? null,
		interpassMax: row.interpassMax ?? null,
		fillerClasses: row.fillerClasses,
		pqrs: row.pqrs
	};
}

/** A WPS as the API answers it: the record, the fields as typed, its id and version. */
export function wpsJson(row: WpsRow) {
	return {
		id: row.id,
		projectId: row.projectId,
		...recordOf(row),
		label: wpsLabel(row),
		typed: typedOf(recordOf(row)),
		version: row.version,
		updatedAt: row.updatedAt
	};
}
export type WpsJson = ReturnType<typeof wpsJson>;

export function list(projectId: number, reader: Reader = db): WpsRow[] {
	return reader
		.select()
		.from(w)
		.where(eq(w.projectId, projectId))
		.orderBy(asc(w.number), asc(w.revision), asc(w.id))
		.all();
}

export function row(wpsId: number, reader: Reader = db): WpsRow | undefined {
	return reader.select().from(w).where(eq(w.id, wpsId)).get();
}

/** The WPSs a joint may name: the approved ones, by number. */
export function approved(projectId: number, reader: Reader = db): WpsRow[] {
	return list(projectId, reader).filter((r) => r.status === 'approved');
}

/**
 * A WPS of the project by its number (any case) and revision; without the revision, the
 * approved one (the latest approved where more than one is).
 */
export function byNumber(
	projectId: number,
	number: string,
	revision?: string,
	reader: Reader = db
): WpsRow | undefined {
	const same = list(projectId, reader).filter(
		(r) => r.number.toUpperCase() === number.trim().toUpperCase()
	);
	if (revision !== undefined) {
		return same.find((r) => r.revision.toUpperCase() === revision.trim().toUpperCase());
	}
	return same.filter((r) => r.status === 'approved').sort((a, b) => b.id - a.id)[0];
}

/** A WPS as typed, read in the project's units, or the first problem as a 400 naming its field. */
export function readOrThrow(typed: WpsTyped, projectId: number, reader: Reader = db): WpsRecord {
	const read = readWps(typed, projects.unitsOf(projectId, reader));
	if (!read.ok) {
		const [first] = read.problems;
		throw new DomainError(first.message, 400, first.field);
	}
	return read.record;
}

function checkUnique(tx: Reader, projectId: number, record: WpsRecord, exceptId?: number) {
	const clash = tx
		.select({ id: w.id })
		.from(w)
		.where(
			and(
				eq(w.projectId, projectId),
				sql`upper(${w.number}) = upper(${record.number})`,
				sql`upper(${w.revision}) = upper(${record.revision})`,
				exceptId === undefined ? undefined : ne(w.id, exceptId)
			)
		)
		.get();
	if (clash) {
		throw new DomainError(
			`WPS ${wpsLabel(record)} is already in this project's register; give the next revision or change that one.`,
			409,
			'number'
		);
	}
}

/**
 * Joints whose WPS was typed before the register had it (`WPS-CS-01 GTAW/SMAW`) name the
 * approved WPS whose number is that text's first word, at its latest approved revision.
 */
export function linkTypedJoints(tx: Tx, projectId: number): number {
	const candidates = approved(projectId, tx);
	let linked = 0;
	const byNumber = new Map<string, WpsRow>();
	for (const r of candidates) byNumber.set(r.number.toUpperCase(), r);
	if (byNumber.size === 0) return 0;
	const loose = tx
		.select({ id: schema.joints.id, wps: schema.joints.wps })
		.from(schema.joints)
		.where(
			and(
				eq(schema.joints.projectId, projectId),
				isNull(schema.joints.wpsId),
				ne(schema.joints.wps, '')
			)
		)
		.all();
	for (const joint of loose) {
		const first = joint.wps.trim().split(/\s+/)[0]?.toUpperCase() ?? '';
		const match = byNumber.get(first);
		if (!match) continue;
		tx.update(schema.joints)
			.set({ wpsId: match.id, version: sql`${schema.joints.version} + 1`, updatedAt: Date.now() })
			.where(eq(schema.joints.id, joint.id))
			.run();
		linked++;
	}
	return linked;
}

function insert(tx: Tx, projectId: number, record: WpsRecord, userId: string | null): WpsRow {
	checkUnique(tx, projectId, record);
	const created = tx
		.insert(w)
		.values({ projectId, ...record, createdBy: userId })
		.returning()
		.get();
	audit.record(
		{
			action: 'create',
			entity: 'wps',
			entityId: created.id,
			userId,
			projectId,
			after: wpsJson(created).typed
		},
		tx
	);
	return created;
}

/** Add a WPS to the register; a number and revision already there is a 409. */
export function create(projectId: number, typed: WpsTyped, userId: string | null): WpsRow {
	return db.transaction((tx) => {
		const record = readOrThrow(typed, projectId, tx);
		const created = insert(tx, projectId, record, userId);
		if (created.status === 'approved') linkTypedJoints(tx, projectId);
		return created;
	});
}

/** Change a WPS: the fields given, on the version the change was made on (409 if stale). */
export function update(
	projectId: number,
	wpsId: number,
	changes: Partial<WpsTyped> & { version: number },
	userId: string | null
): WpsRow {
	return db.transaction((tx) => {
		const current = row(wpsId, tx);
		if (!current || current.projectId !== projectId) {
			throw new DomainError('There is no such WPS in this project.', 404);
		}
		if (current.version !== changes.version) {
			throw new DomainError(
				`WPS ${wpsLabel(current)} was changed by someone else since you opened it; reload to see the change.`,
				409,
				'version'
			);
		}
		const before = typedOf(recordOf(current));
		const { version: _version, ...fields } = changes;
		const typed = { ...before, ...stripUndefined(fields) };
		const record = readOrThrow(typed, projectId, tx);
		checkUnique(tx, projectId, record, wpsId);
		const updated = tx
			.update(w)
			.set({ ...record, version: current.version + 1, updatedAt: Date.now() })
			.where(eq(w.id, wpsId))
			.returning()
			.get();
		const after = typedOf(record);
		const changed = (Object.keys(after) as WpsField[]).filter((k) => after[k] !== before[k]);
		audit.record(
			{
				action: 'update',
				entity: 'wps',
				entityId: wpsId,
				userId,
				projectId,
				before: Object.fromEntries(changed.map((k) => [k, before[k]])),
				after: Object.fromEntries(changed.map((k) => [k, after[k]]))
			},
			tx
		);
		if (updated.status === 'approved') linkTypedJoints(tx, projectId);
		return updated;
	});
}

function stripUndefined<T extends object>(value: T): Partial<T> {
	return Object.fromEntries(Object.entries(value).filter(([, v]) => v !== undefined)) as Partial<T>;
}

/** The field's label, for messages naming a CSV column or a form field. */
export const fieldLabel = (field: WpsField) => WPS_FIELD_LABELS[field];

export { insert as insertInTransaction };

export interface WpsImportPreview {
	ok: boolean;
	/** the WPS lines read, each with its line, label and status */
	rows: { line: number; label: string; status: string; processes: string[] }[];
	problems: WpsCsvProblem[];
}

/**
 * A WPS register CSV checked against the file's own rules and the project's register (a number
 * and revision already there is a problem of its line); with `apply`, and no problem, every
 * WPS is added in one transaction. Any problem and nothing is stored.
 */
export function importCsv(
	projectId: number,
	text: string,
	options: { apply: boolean; userId: string | null }
): WpsImportPreview {
	return db.transaction((tx) => {
		const read = readWpsCsv(text, projects.unitsOf(projectId, tx));
		if (!read.ok) return { ok: false, rows: [], problems: read.problems };
		const existing = new Set(
			list(projectId, tx).map((r) => `${r.number}\u0000${r.revision}`.toUpperCase())
		);
		const problems: WpsCsvProblem[] = read.rows
			.filter(({ record }) =>
				existing.has(`${record.number}\u0000${record.revision}`.toUpperCase())
			)
			.map(({ line, record }) => ({
				line,
				column: WPS_FIELD_LABELS.number,
				message: `WPS ${wpsLabel(record)} is already in this project's register.`
			}));
		const rows = read.rows.map(({ line, record }) => ({
			line,
			label: wpsLabel(record),
			status: record.status,
			processes: record.processes
		}));
		if (problems.length > 0) return { ok: false, rows, problems };
		if (options.apply) {
			for (const { record } of read.rows) insert(tx, projectId, record, options.userId);
			linkTypedJoints(tx, projectId);
		}
		return { ok: true, rows, problems: [] };
	});
}
