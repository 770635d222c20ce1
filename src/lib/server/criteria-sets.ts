/**
 * A project's own criteria sets: a built-in set (or another of the project's sets) with some
 * limits changed, each change resting on a clause of the project specification. Built-in sets
 * live in code; project sets in `criteria_sets`, one row per version, never changed once
 * written, so a result keeps resolving to the limits it was judged by.
 *
 * A row's key is `{projectId}/{setId}@{version}`: set ids are the project's own (two projects
 * may both have a `pl-01`), and a revision is a new row. `base_id` is a built-in id, or
 * `{setId}@{version}` of the project set it was derived from. Each row holds every limit that
 * version changes from its base, so a version is its base plus its own row, nothing else.
 */
import { DomainError } from './errors';
import { and, asc, eq, like } from 'drizzle-orm';
import { db, schema, type Db } from './db';
import * as audit from './audit';
import * as projects from './projects';
import {
	builtInCriteriaSetIds,
	checkIds,
	CriteriaSetError,
	criteriaSets as builtInSets,
	deriveCriteriaSet,
	getCriteriaSet,
	type CheckId,
	type CriteriaSet,
	type Limit,
	type LimitOverride
} from '$lib/acceptance';
import { checkDefinitions } from '$lib/acceptance/checks';
import {
	readOverrides,
	type CriteriaChoice,
	type CriteriaSetInput
} from '$lib/schemas/criteria-set';
import type { CriteriaSetRow } from './db/schema';

type Reader = Pick<Db, 'select'>;
type Overrides = Partial<Record<CheckId, LimitOverride>>;

const t = schema.criteriaSets;

export function isBuiltIn(id: string): boolean {
	return builtInCriteriaSetIds.includes(id);
}

const rowKey = (projectId: number, id: string, version: number) => `${projectId}/${id}@${version}`;

function setIdOf(row: CriteriaSetRow): string {
	return row.id.slice(row.id.indexOf('/') + 1, row.id.lastIndexOf('@'));
}

/** What a derived set names as its base: a built-in id, or a project set at one version. */
function baseRef(base: CriteriaSet): string {
	return isBuiltIn(base.id) ? base.id : `${base.id}@${base.version}`;
}

function parseBaseRef(ref: string): { id: string; version?: number } {
	const match = /^(.+)@(\d+)$/.exec(ref);
	return match ? { id: match[1], version: Number(match[2]) } : { id: ref };
}

/** Every version of one set of the project, oldest first. Set ids hold no `%` or `_`. */
function versionRows(projectId: number, id: string, reader: Reader): CriteriaSetRow[] {
	return reader
		.select()
		.from(t)
		.where(and(eq(t.projectId, projectId), like(t.id, `${projectId}/${id}@%`)))
		.orderBy(asc(t.version))
		.all()
		.filter((row) => setIdOf(row) === id);
}

function latestRow(projectId: number, id: string, reader: Reader): CriteriaSetRow | undefined {
	return versionRows(projectId, id, reader).at(-1);
}

function versionRow(projectId: number, id: string, version: number, reader: Reader) {
	return reader
		.select()
		.from(t)
		.where(eq(t.id, rowKey(projectId, id, version)))
		.get();
}

/** The set a row stands for: its base with the row's limits over it. */
function build(row: CriteriaSetRow, reader: Reader, depth = 0): CriteriaSet {
	const ref = parseBaseRef(row.baseId);
	let base: CriteriaSet | undefined;
	if (ref.version === undefined) base = getCriteriaSet(ref.id);
	else if (depth < 20) {
		const baseRow = versionRow(row.projectId, ref.id, ref.version, reader);
		base = baseRow && build(baseRow, reader, depth + 1);
	}
	if (!base) {
		throw new Error(`Criteria set ${row.id} is based on "${row.baseId}", which is not known.`);
	}
	return deriveCriteriaSet(base, {
		id: setIdOf(row),
		name: row.name,
		overrides: row.overrides,
		version: row.version
	});
}

// Reading -----------------------------------------------------------------------------------

/** One of the project's own sets, at its latest version or the one asked for. */
export function get(
	projectId: number,
	id: string,
	version?: number,
	reader: Reader = db
): CriteriaSet | undefined {
	const row =
		version === undefined
			? latestRow(projectId, id, reader)
			: versionRow(projectId, id, version, reader);
	return row && build(row, reader);
}

/**
 * The set an id names for a joint of this project: a built-in set (which has one version),
 * or one of the project's own at its latest version or the one asked for.
 */
export function resolve(
	projectId: number,
	id: string,
	version?: number,
	reader: Reader = db
): CriteriaSet | undefined {
	return getCriteriaSet(id) ?? get(projectId, id, version, reader);
}

export interface VersionInfo {
	version: number;
	name: string;
	createdAt: number;
	createdBy: string | null;
}

export interface ProjectSet {
	set: CriteriaSet;
	/** a built-in id, or `{setId}@{version}` of the project set it was derived from */
	baseId: string;
	versions: VersionInfo[];
}

/** The project's own sets at their latest versions, by id, each with its versions. */
export function list(projectId: number, reader: Reader = db): ProjectSet[] {
	const rows = reader
		.select({ row: t, by: schema.users.name, email: schema.users.email })
		.from(t)
		.leftJoin(schema.users, eq(schema.users.id, t.createdBy))
		.where(eq(t.projectId, projectId))
		.orderBy(asc(t.id))
		.all();
	const byId = new Map<string, typeof rows>();
	for (const entry of rows) {
		const id = setIdOf(entry.row);
		byId.set(id, [...(byId.get(id) ?? []), entry]);
	}
	return [...byId.entries()]
		.sort(([a], [b]) => a.localeCompare(b))
		.map(([, entries]) => {
			entries.sort((a, b) => a.row.version - b.row.version);
			const latest = entries[entries.length - 1].row;
			return {
				set: build(latest, reader),
				baseId: latest.baseId,
				versions: entries.map(({ row, by, email }) => ({
					version: row.version,
					name: row.name,
					createdAt: row.createdAt,
					createdBy: by ?? email ?? null
				}))
			};
		});
}

/** What a picker offers in this project: the built-in sets, then the project's own. */
export function choices(projectId: number, reader: Reader = db): CriteriaChoice[] {
	return [
		...builtInSets.map(({ id, name, version }) => ({ id, name, version, builtIn: true })),
		...list(projectId, reader).map(({ set }) => ({
			id: set.id,
			name: set.name,
			version: set.version,
			builtIn: false
		}))
	];
}

/** A refusal naming the sets a project can use, for an id it does not know. */
export function unknownSet(projectId: number, id: string, field: string, reader: Reader = db) {
	const known = choices(projectId, reader).map((choice) => choice.id);
	return new DomainError(
		`"${id}" is not a criteria set of this project; use one of: ${known.join(', ')}.`,
		400,
		field
	);
}

/** Each limit with its clause, how sure it is, where it applies and its rule, as the API shows it. */
export function limitsJson(limits: CriteriaSet['limits']) {
	return checkIds.flatMap((check) => {
		const limit: Limit | undefined = limits[check];
		if (!limit) return [];
		const { rule, clause, confidence, note, kinds, stages } = limit;
		return [
			{
				check,
				clause,
				confidence,
				note: note ?? null,
				kinds: kinds ?? checkDefinitions[check].kinds,
				stages: stages ?? checkDefinitions[check].stages,
				rule
			}
		];
	});
}

/** A project set as the API shows it: the set with its base, versions and limits. */
export function projectSetJson({ set, baseId, versions }: ProjectSet) {
	const { limits, ...rest } = set;
	return { ...rest, baseId, versions, limits: limitsJson(limits) };
}

// Writing -----------------------------------------------------------------------------------

function readOrThrow(input: CriteriaSetInput, projectId: number, reader: Reader): Overrides {
	const read = readOverrides(input.overrides, projects.unitsOf(projectId, reader));
	if (!read.ok) throw new DomainError(read.message, 400, read.field);
	return read.overrides;
}

function deriveOrThrow(base: CriteriaSet, changes: Parameters<typeof deriveCriteriaSet>[1]) {
	try {
		return deriveCriteriaSet(base, changes);
	} catch (error) {
		if (error instanceof CriteriaSetError) {
			throw new DomainError(error.message, 400, error.field);
		}
		throw error;
	}
}

/** JSON with its keys sorted, to tell whether a revision changes anything. */
function canonical(value: unknown): string {
	return JSON.stringify(value, (_key, v: unknown) =>
		v && typeof v === 'object' && !Array.isArray(v)
			? Object.fromEntries(Object.entries(v).sort(([a], [b]) => a.localeCompare(b)))
			: v
	);
}

/**
 * Derive a new set of the project from `input.base` (a built-in set, or one of the project's
 * own at its latest version). Its id is free in the project and not a built-in one.
 */
export function create(projectId: number, input: CriteriaSetInput, userId: string): CriteriaSet {
	return db.transaction((tx) => {
		if (isBuiltIn(input.id)) {
			throw new DomainError(
				`"${input.id}" is a built-in criteria set; choose another id.`,
				400,
				'id'
			);
		}
		const taken = latestRow(projectId, input.id, tx);
		if (taken) {
			throw new DomainError(
				`This project already has a criteria set "${input.id}" (version ${taken.version}); revise it, or choose another id.`,
				409,
				'id'
			);
		}
		const base =
			input.base === undefined ? undefined : resolve(projectId, input.base, undefined, tx);
		if (!base) throw unknownSet(projectId, input.base ?? '', 'base', tx);
		const overrides = readOrThrow(input, projectId, tx);
		const set = deriveOrThrow(base, { id: input.id, name: input.name, overrides, version: 1 });
		const now = Date.now();
		tx.insert(t)
			.values({
				id: rowKey(projectId, set.id, 1),
				projectId,
				baseId: baseRef(base),
				name: set.name,
				version: 1,
				overrides,
				createdBy: userId,
				createdAt: now
			})
			.run();
		audit.record(
			{
				action: 'create',
				entity: 'criteria_set',
				entityId: set.id,
				projectId,
				userId,
				at: now,
				before: null,
				after: { name: set.name, version: 1, base: baseRef(base), overrides }
			},
			tx
		);
		return set;
	});
}

/**
 * A new version of one of the project's sets, from the version the change was made on
 * (`input.revises`; another in between is a 409). `input.overrides` are all the limits the
 * new version changes from the set's base; the set keeps its base. Earlier versions stay.
 */
export function revise(projectId: number, input: CriteriaSetInput, userId: string): CriteriaSet {
	return db.transaction((tx) => {
		const latest = latestRow(projectId, input.id, tx);
		if (!latest) {
			if (isBuiltIn(input.id)) {
				throw new DomainError(
					`"${input.id}" is a built-in criteria set and is not changed; derive a set of the project from it instead.`,
					400,
					'id'
				);
			}
			throw new DomainError(`This project has no criteria set "${input.id}" to revise.`, 404, 'id');
		}
		if (input.revises !== latest.version) {
			throw new DomainError(
				`Criteria set "${input.id}" is at version ${latest.version} now, not ${input.revises}: someone revised it meanwhile. Reload it and make the change again.`,
				409,
				'revises'
			);
		}
		const overrides = readOrThrow(input, projectId, tx);
		if (latest.name === input.name && canonical(latest.overrides) === canonical(overrides)) {
			throw new DomainError(
				`The revision changes nothing in "${input.id}" version ${latest.version}.`,
				400,
				'overrides'
			);
		}
		const version = latest.version + 1;
		const set = build({ ...latest, name: input.name, overrides, version }, tx);
		const now = Date.now();
		tx.insert(t)
			.values({
				id: rowKey(projectId, set.id, version),
				projectId,
				baseId: latest.baseId,
				name: set.name,
				version,
				overrides,
				createdBy: userId,
				createdAt: now
			})
			.run();
		audit.record(
			{
				action: 'revise',
				entity: 'criteria_set',
				entityId: set.id,
				projectId,
				userId,
				at: now,
				before: { name: latest.name, version: latest.version, overrides: latest.overrides },
				after: { name: set.name, version, overrides }
			},
			tx
		);
		return set;
	});
}

/** Create or revise, as the request says: `revises` names the version a revision starts from. */
export function save(projectId: number, input: CriteriaSetInput, userId: string) {
	return input.revises === undefined
		? { created: true, set: create(projectId, input, userId) }
		: { created: false, set: revise(projectId, input, userId) };
}
