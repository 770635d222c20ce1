/**
 * The whole data model. Lengths are millimetres and angles degrees, with the text the user
 * typed kept beside them; times are UTC milliseconds (Auth.js's own columns use its
 * timestamp_ms dates). Inspections are append-only: a correction is a new row that names
 * the row it supersedes.
 */
import { sql } from 'drizzle-orm';
import {
	sqliteTable,
	text,
	integer,
	real,
	primaryKey,
	index,
	uniqueIndex,
	type AnySQLiteColumn
} from 'drizzle-orm/sqlite-core';
import type { AdapterAccountType } from '@auth/core/adapters';
import { JOINT_STATES, type JointState } from '../../joint-state';
import {
	JOINT_KINDS,
	JOINT_LOCATIONS,
	UNIT_SYSTEMS,
	WELD_PASSES,
	type Decision,
	type InspectionStage,
	type JointKind,
	type JointLocation,
	type NdeMethod,
	type UnitSystem,
	type Verdict,
	type WeldPass
} from '../../domain';
import type { ProjectRole } from '../../permissions';
import type { CheckId, Finding, IndicationType } from '../../acceptance/types';
import type { LimitOverride } from '../../acceptance/derive';
import type { LotGrouping, LotRule } from '../../nde/extent';
import type { LotStage, SelectionReason } from '../../nde/sampling';
import type { TileFormat, TileLevel, TileStatus } from '../../sheet-tiles';
import type { WpsRanges, WpsStatus, WpsTemperature } from '../../wps-register';

export type { ProjectRole };
export {
	UNIT_SYSTEMS,
	JOINT_KINDS,
	JOINT_LOCATIONS,
	WELD_PASSES,
	type UnitSystem,
	type JointKind,
	type JointLocation,
	type WeldPass
};
export const DRAWING_KINDS = ['isometric', 'shop', 'structural'] as const;
export type PinReviewReason = 'moved' | 'missing';
export type SuggestionStatus = 'open' | 'accepted' | 'dismissed';
export type ReadingStatus = 'queued' | 'reading' | 'done' | 'failed';
export type DrawingKind = (typeof DRAWING_KINDS)[number];

const now = sql`(cast(unixepoch('subsec') * 1000 as integer))`;
const createdAt = () => integer('created_at').notNull().default(now);

/** One reading as stored on an inspection: what was typed, and its value in mm or degrees. */
export interface StoredReading {
	id: string;
	text: string;
	value: number | boolean | null;
	/** mm, degrees, yes/no, a count of pores, or µm Ra; null where the text could not be read */
	unit: 'mm' | 'deg' | 'bool' | 'count' | 'um' | null;
}

/** One check of a verdict, exactly as the acceptance engine reported it. */
export type StoredFinding = Finding;

export interface WeldNumberRule {
	/** Prefix for shop and field joints, e.g. `''` and `FW-`. */
	shopPrefix: string;
	fieldPrefix: string;
	/** Numbers run per drawing (the usual) or per line. */
	sequence: 'drawing' | 'line';
}

/**
 * How NDE lots form and what extent they carry, agreed before work starts. Read it through
 * `readLotRule` (src/lib/nde/extent.ts), which also reads the older shape (a `percent` per
 * method and four groupings) still in the column's default.
 */
export type NdeLotRule = Partial<LotRule> & {
	/** The older shape: extent per method for every joint. */
	percent?: Partial<Record<NdeMethod, number>>;
};

// Auth.js and people ------------------------------------------------------------------

export const users = sqliteTable('users', {
	id: text('id')
		.primaryKey()
		.$defaultFn(() => crypto.randomUUID()),
	name: text('name'),
	email: text('email').notNull().unique(),
	emailVerified: integer('email_verified', { mode: 'timestamp_ms' }),
	image: text('image'),
	passwordHash: text('password_hash'),
	isAdmin: integer('is_admin', { mode: 'boolean' }).notNull().default(false),
	disabledAt: integer('disabled_at'),
	/**
	 * Raised by sign-out, a password change or reset and disabling the account: a session
	 * signed with an older number is over, whatever its cookie still says.
	 */
	sessionGeneration: integer('session_generation').notNull().default(0),
	createdAt: createdAt()
});

export const accounts = sqliteTable(
	'accounts',
	{
		userId: text('user_id')
			.notNull()
			.references(() => users.id, { onDelete: 'cascade' }),
		type: text('type').$type<AdapterAccountType>().notNull(),
		provider: text('provider').notNull(),
		providerAccountId: text('provider_account_id').notNull(),
		refresh_token: text('refresh_token'),
		access_token: text('access_token'),
		expires_at: integer('expires_at'),
		token_type: text('token_type'),
		scope: text('scope'),
		id_token: text('id_token'),
		session_state: text('session_state')
	},
	(t) => [
		primaryKey({ columns: [t.provider, t.providerAccountId] }),
		index('accounts_user').on(t.userId)
	]
);

export const sessions = sqliteTable('sessions', {
	sessionToken: text('session_token').primaryKey(),
	userId: text('user_id')
		.notNull()
		.references(() => users.id, { onDelete: 'cascade' }),
	expires: integer('expires', { mode: 'timestamp_ms' }).notNull()
});

export const verificationTokens = sqliteTable(
	'verification_tokens',
	{
		identifier: text('identifier').notNull(),
		token: text('token').notNull(),
		expires: integer('expires', { mode: 'timestamp_ms' }).notNull()
	},
	(t) => [primaryKey({ columns: [t.identifier, t.token] })]
);

/** Personal tokens for scripts and integrators; only a hash is kept. */
export const apiTokens = sqliteTable(
	'api_tokens',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		userId: text('user_id')
			.notNull()
			.references(() => users.id, { onDelete: 'cascade' }),
		name: text('name').notNull(),
		tokenHash: text('token_hash').notNull().unique(),
		/** The first characters, shown in lists so a person can tell tokens apart. */
		prefix: text('prefix').notNull(),
		createdAt: createdAt(),
		lastUsedAt: integer('last_used_at'),
		revokedAt: integer('revoked_at')
	},
	(t) => [index('api_tokens_user').on(t.userId)]
);

// Projects ----------------------------------------------------------------------------

export const projects = sqliteTable('projects', {
	id: integer('id').primaryKey({ autoIncrement: true }),
	code: text('code').notNull().unique(),
	name: text('name').notNull(),
	client: text('client').notNull().default(''),
	contractor: text('contractor').notNull().default(''),
	site: text('site').notNull().default(''),
	units: text('units').$type<UnitSystem>().notNull().default('imperial'),
	defaultCriteriaSet: text('default_criteria_set').notNull().default('asme-b31.3-normal'),
	weldNumberRule: text('weld_number_rule', { mode: 'json' })
		.$type<WeldNumberRule>()
		.notNull()
		.default({ shopPrefix: '', fieldPrefix: 'FW-', sequence: 'drawing' }),
	ndeLotRule: text('nde_lot_rule', { mode: 'json' })
		.$type<NdeLotRule>()
		.notNull()
		.default({ groupBy: 'line', percent: { RT: 5 }, everyWelder: true }),
	/** Photos keep their GPS position (off: location data is dropped at upload). */
	photosKeepLocation: integer('photos_keep_location', { mode: 'boolean' }).notNull().default(false),
	createdAt: createdAt()
});

export const memberships = sqliteTable(
	'memberships',
	{
		projectId: integer('project_id')
			.notNull()
			.references(() => projects.id, { onDelete: 'cascade' }),
		userId: text('user_id')
			.notNull()
			.references(() => users.id, { onDelete: 'cascade' }),
		role: text('role').$type<ProjectRole>().notNull(),
		createdAt: createdAt()
	},
	(t) => [primaryKey({ columns: [t.projectId, t.userId] }), index('memberships_user').on(t.userId)]
);

/**
 * A project's own criteria, derived from a built-in set (or another project set); built-in
 * sets live in code. One row per version, never changed once written, so a result keeps the
 * limits it was judged by: `id` is the row's key `{projectId}/{setId}@{version}` (see
 * `src/lib/server/criteria-sets.ts`); `base_id` is a built-in id, or `{setId}@{version}` of
 * the project set it was derived from; `overrides` are all the limits this version changes
 * from its base, in mm and degrees.
 */
export const criteriaSets = sqliteTable(
	'criteria_sets',
	{
		id: text('id').primaryKey(),
		projectId: integer('project_id')
			.notNull()
			.references(() => projects.id, { onDelete: 'cascade' }),
		baseId: text('base_id').notNull(),
		name: text('name').notNull(),
		version: integer('version').notNull().default(1),
		overrides: text('overrides', { mode: 'json' })
			.$type<Partial<Record<CheckId, LimitOverride>>>()
			.notNull(),
		createdBy: text('created_by').references(() => users.id),
		createdAt: createdAt()
	},
	(t) => [index('criteria_sets_project').on(t.projectId)]
);

/**
 * The project's WPS register: one row per number and revision. Lists are JSON arrays; the
 * ranges keep each end's value (mm or degrees) beside the text as typed, in the project's
 * units; temperatures keep °C beside the text. Rules in `src/lib/wps-register.ts`.
 */
export const wps = sqliteTable(
	'wps',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		projectId: integer('project_id')
			.notNull()
			.references(() => projects.id, { onDelete: 'cascade' }),
		number: text('number').notNull(),
		revision: text('revision').notNull(),
		status: text('status').$type<WpsStatus>().notNull().default('draft'),
		title: text('title').notNull().default(''),
		processes: text('processes', { mode: 'json' }).$type<string[]>().notNull(),
		materialGroups: text('material_groups', { mode: 'json' }).$type<string[]>().notNull(),
		ranges: text('ranges', { mode: 'json' }).$type<WpsRanges>().notNull(),
		grooveType: text('groove_type').notNull().default(''),
		preheatMin: text('preheat_min', { mode: 'json' }).$type<WpsTemperature | null>(),
		interpassMax: text('interpass_max', { mode: 'json' }).$type<WpsTemperature | null>(),
		fillerClasses: text('filler_classes', { mode: 'json' }).$type<string[]>().notNull(),
		pqrs: text('pqrs', { mode: 'json' }).$type<string[]>().notNull(),
		version: integer('version').notNull().default(1),
		createdBy: text('created_by').references(() => users.id),
		createdAt: createdAt(),
		updatedAt: integer('updated_at').notNull().default(now)
	},
	(t) => [uniqueIndex('wps_project_number_revision').on(t.projectId, t.number, t.revision)]
);

// Drawings ----------------------------------------------------------------------------

export const drawings = sqliteTable(
	'drawings',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		projectId: integer('project_id')
			.notNull()
			.references(() => projects.id, { onDelete: 'cascade' }),
		number: text('number').notNull(),
		title: text('title').notNull().default(''),
		kind: text('kind').$type<DrawingKind>().notNull(),
		line: text('line').notNull().default(''),
		area: text('area').notNull().default(''),
		system: text('system').notNull().default(''),
		/** Raised by every edit of the register data; an edit names the version it was based on. */
		version: integer('version').notNull().default(1),
		createdAt: createdAt()
	},
	(t) => [
		uniqueIndex('drawings_project_number').on(t.projectId, t.number),
		index('drawings_project_area').on(t.projectId, t.area),
		index('drawings_project_kind').on(t.projectId, t.kind),
		index('drawings_project_system').on(t.projectId, t.system)
	]
);

export const revisions = sqliteTable(
	'revisions',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		drawingId: integer('drawing_id')
			.notNull()
			.references(() => drawings.id, { onDelete: 'cascade' }),
		label: text('label').notNull(),
		status: text('status').$type<'current' | 'superseded'>().notNull(),
		note: text('note').notNull().default(''),
		/** The date on the revision block, `YYYY-MM-DD`. */
		issuedOn: text('issued_on'),
		fileKey: text('file_key').notNull(),
		fileName: text('file_name').notNull(),
		sha256: text('sha256').notNull(),
		bytes: integer('bytes').notNull(),
		pageCount: integer('page_count').notNull(),
		uploadedBy: text('uploaded_by').references(() => users.id),
		uploadedAt: integer('uploaded_at').notNull().default(now),
		supersededAt: integer('superseded_at')
	},
	(t) => [
		uniqueIndex('revisions_drawing_label').on(t.drawingId, t.label),
		index('revisions_drawing_status').on(t.drawingId, t.status),
		index('revisions_sha256').on(t.sha256)
	]
);

/** One sheet: a page of a revision, with its view box in PDF points and its rotation. */
export const pages = sqliteTable(
	'pages',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		revisionId: integer('revision_id')
			.notNull()
			.references(() => revisions.id, { onDelete: 'cascade' }),
		pageIndex: integer('page_index').notNull(),
		x0: real('x0').notNull(),
		y0: real('y0').notNull(),
		x1: real('x1').notNull(),
		y1: real('y1').notNull(),
		rotation: integer('rotation').$type<0 | 90 | 180 | 270>().notNull().default(0)
	},
	(t) => [uniqueIndex('pages_revision_index').on(t.revisionId, t.pageIndex)]
);

/**
 * A sheet rendered once on the server into a pyramid of image tiles (stored under the
 * revision, see src/lib/server/tiles.ts), so the viewer shows it at once. `raster`: the sheet
 * is a scan (one big image), which the viewer shows from its tiles alone.
 */
export const sheetTiles = sqliteTable(
	'sheet_tiles',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		revisionId: integer('revision_id')
			.notNull()
			.references(() => revisions.id, { onDelete: 'cascade' }),
		pageIndex: integer('page_index').notNull(),
		status: text('status').$type<TileStatus>().notNull().default('queued'),
		raster: integer('raster', { mode: 'boolean' }).notNull().default(false),
		format: text('format').$type<TileFormat>(),
		tileSize: integer('tile_size').notNull().default(512),
		/** The sheet in sheet units (PDF points × the page's UserUnit, rotation applied). */
		width: real('width'),
		height: real('height'),
		levels: text('levels', { mode: 'json' }).$type<TileLevel[]>().notNull().default([]),
		tiles: integer('tiles').notNull().default(0),
		bytes: integer('bytes').notNull().default(0),
		renderMs: integer('render_ms'),
		error: text('error'),
		queuedAt: integer('queued_at').notNull().default(now),
		finishedAt: integer('finished_at')
	},
	(t) => [
		uniqueIndex('sheet_tiles_revision_page').on(t.revisionId, t.pageIndex),
		index('sheet_tiles_status').on(t.status)
	]
);

// Weld numbers read from the sheets --------------------------------------------------

/**
 * The reading of one revision's sheets for weld numbers (the finder, run in the background
 * after upload or on demand), and what carrying the previous revision's pins gave.
 */
export const sheetReadings = sqliteTable('sheet_readings', {
	revisionId: integer('revision_id')
		.primaryKey()
		.references(() => revisions.id, { onDelete: 'cascade' }),
	status: text('status').$type<ReadingStatus>().notNull().default('queued'),
	/** False when no sheet of the revision carries text (a scan). */
	textLayer: integer('text_layer', { mode: 'boolean' }),
	found: integer('found').notNull().default(0),
	error: text('error'),
	/** Pins carried from the previous revision: in place, moved to their number, or flagged. */
	pinsCarried: integer('pins_carried'),
	pinsMoved: integer('pins_moved'),
	pinsFlagged: integer('pins_flagged'),
	readMs: integer('read_ms'),
	queuedAt: integer('queued_at').notNull().default(now),
	finishedAt: integer('finished_at')
});

/**
 * A weld number found on a sheet. `open`: not on the drawing yet, offered as a pin to accept;
 * `accepted`: on the drawing (`jointId`), whether accepted here or already there when read;
 * `dismissed`: turned down. Every label found is kept, so the next revision can be matched.
 */
export const sheetSuggestions = sqliteTable(
	'sheet_suggestions',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		revisionId: integer('revision_id')
			.notNull()
			.references(() => revisions.id, { onDelete: 'cascade' }),
		pageIndex: integer('page_index').notNull(),
		number: text('number').notNull(),
		/** PDF points: the centre of the printed number. */
		x: real('x').notNull(),
		y: real('y').notNull(),
		/** The weld the label points at (leader, dot or tick), where a pin is best placed. */
		targetX: real('target_x'),
		targetY: real('target_y'),
		status: text('status').$type<SuggestionStatus>().notNull().default('open'),
		jointId: integer('joint_id').references((): AnySQLiteColumn => joints.id, {
			onDelete: 'set null'
		}),
		decidedBy: text('decided_by').references(() => users.id),
		decidedAt: integer('decided_at'),
		createdAt: createdAt()
	},
	(t) => [
		index('sheet_suggestions_revision_status').on(t.revisionId, t.status),
		uniqueIndex('sheet_suggestions_revision_number').on(t.revisionId, t.number)
	]
);

// Joints and their records ------------------------------------------------------------

/**
 * A joint's state as its place in the workflow (JOINT_STATES order), so the log sorts by
 * state as the job moves rather than alphabetically. The query must use this same
 * expression for SQLite to read the order off the index `joints_project_rank`.
 */
export const stateRank = sql.raw(
	`(case "state" ${JOINT_STATES.map((state, n) => `when '${state}' then ${n}`).join(' ')} end)`
);

export const joints = sqliteTable(
	'joints',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		/** Kept beside the drawing so project-wide lists filter on one index. */
		projectId: integer('project_id')
			.notNull()
			.references(() => projects.id, { onDelete: 'cascade' }),
		drawingId: integer('drawing_id')
			.notNull()
			.references(() => drawings.id, { onDelete: 'cascade' }),
		/** As written on the map, e.g. `12`, `5A`, `FW-3`; unique per drawing and never reused. */
		number: text('number').notNull(),
		/** Sorts numbers as a person reads them (5 < 5A < 6 < 10). */
		sortKey: text('sort_key').notNull(),
		kind: text('kind').$type<JointKind>().notNull(),
		location: text('location').$type<JointLocation>().notNull().default('shop'),
		line: text('line').notNull().default(''),
		spool: text('spool').notNull().default(''),
		sizeText: text('size_text').notNull().default(''),
		/** Outside diameter for pipe, or null where the size is a nominal name only. */
		diameterMm: real('diameter_mm'),
		thicknessText: text('thickness_text').notNull().default(''),
		thicknessMm: real('thickness_mm'),
		requiredSizeText: text('required_size_text').notNull().default(''),
		requiredSizeMm: real('required_size_mm'),
		material: text('material').notNull().default(''),
		/** The WPS as once typed; kept readable where it names no WPS of the register. */
		wps: text('wps').notNull().default(''),
		/** The joint's WPS from the project's register. */
		wpsId: integer('wps_id').references((): AnySQLiteColumn => wps.id),
		criteriaSetId: text('criteria_set_id').notNull(),
		/** NDE methods this joint must pass in full, e.g. `RT+MT`; sampling adds to it. */
		ndeRequired: text('nde_required').notNull().default(''),
		voidReason: text('void_reason'),
		voidedAt: integer('voided_at'),
		voidedBy: text('voided_by').references(() => users.id),
		/** A cut-out replacement names the joint it replaces. */
		replacesJointId: integer('replaces_joint_id').references((): AnySQLiteColumn => joints.id),
		/** Cache of deriveJointState, written in the same transaction as the record that changes it. */
		state: text('state').$type<JointState>().notNull().default('awaiting_fitup'),
		repairCycle: integer('repair_cycle').notNull().default(0),
		stateSince: integer('state_since').notNull().default(now),
		version: integer('version').notNull().default(1),
		createdBy: text('created_by').references(() => users.id),
		createdAt: createdAt(),
		updatedAt: integer('updated_at').notNull().default(now)
	},
	(t) => [
		uniqueIndex('joints_drawing_number').on(t.drawingId, t.number),
		// Oldest in a state first, the id breaking ties as every list's order does; the repair
		// cycle rides along so the joints find their current weld (the log's weld-date sort)
		// without reading the rows. An index column after the order's must name the id, or
		// SQLite sorts instead.
		index('joints_project_state').on(t.projectId, t.state, t.stateSince, t.id, t.repairCycle),
		index('joints_project_sort').on(t.projectId, t.sortKey),
		index('joints_project_line').on(t.projectId, t.line),
		// The weld log's default order (drawing, then weld number) and its age sort, read
		// straight off an index so a page of 100,000 joints needs no sort.
		// With the id (the order's tie-break), number and line, the text search walks it too.
		index('joints_drawing_sort').on(t.drawingId, t.sortKey, t.id, t.number, t.line),
		index('joints_project_since').on(t.projectId, t.stateSince),
		// Covers the summary's count per drawing and state without touching the rows.
		index('joints_project_drawing_state').on(t.projectId, t.drawingId, t.state),
		// The log's state sort, in workflow order, oldest in each state first.
		index('joints_project_rank').on(t.projectId, stateRank, t.stateSince),
		// Lets the text search count its matches off an index, without reading the rows.
		index('joints_project_search').on(t.projectId, t.drawingId, t.number, t.line)
	]
);

/**
 * How many joints stand in each state on each drawing: what the summary and the board
 * count, so they never group 100,000 joints per request. Kept by triggers on `joints`
 * (written by hand in drizzle/0002_joint_state_counts.sql), so every insert, state change,
 * move or delete updates it in the same transaction. A migration that rebuilds `joints`
 * drops those triggers and must create them again; the counts test catches it if not.
 */
/**
 * A weld number a drawing used and gave up when its joint was renumbered: never handed out or
 * typed again (`key` is the number in capitals, as numbers compare).
 */
export const retiredWeldNumbers = sqliteTable(
	'retired_weld_numbers',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		drawingId: integer('drawing_id')
			.notNull()
			.references(() => drawings.id, { onDelete: 'cascade' }),
		number: text('number').notNull(),
		key: text('key').notNull(),
		jointId: integer('joint_id').references((): AnySQLiteColumn => joints.id, {
			onDelete: 'set null'
		}),
		retiredBy: text('retired_by').references(() => users.id),
		retiredAt: integer('retired_at').notNull().default(now)
	},
	(t) => [uniqueIndex('retired_weld_numbers_drawing_key').on(t.drawingId, t.key)]
);

export const jointStateCounts = sqliteTable(
	'joint_state_counts',
	{
		projectId: integer('project_id')
			.notNull()
			.references(() => projects.id, { onDelete: 'cascade' }),
		drawingId: integer('drawing_id')
			.notNull()
			.references(() => drawings.id, { onDelete: 'cascade' }),
		state: text('state').$type<JointState>().notNull(),
		n: integer('n').notNull()
	},
	(t) => [
		primaryKey({ columns: [t.drawingId, t.state] }),
		index('joint_state_counts_project').on(t.projectId, t.drawingId, t.state, t.n)
	]
);

/**
 * Joints per state for each area and system of a project (the area and system the drawing is
 * in now): what the board's and the summary's area and system rows read, a few hundred rows
 * on a plant job. Kept from `joint_state_counts` and `drawings` by triggers written by hand
 * in drizzle/0006_area_drawing_counts.sql, in the same transaction as the change.
 */
export const areaStateCounts = sqliteTable(
	'area_state_counts',
	{
		projectId: integer('project_id')
			.notNull()
			.references(() => projects.id, { onDelete: 'cascade' }),
		area: text('area').notNull(),
		system: text('system').notNull(),
		state: text('state').$type<JointState>().notNull(),
		n: integer('n').notNull()
	},
	(t) => [primaryKey({ columns: [t.projectId, t.area, t.system, t.state] })]
);

/**
 * One row per drawing with joints: its joints per state as a JSON object (`{"accepted": 12,
 * …}`, states with none left out), so the per-drawing summary reads one row per drawing
 * whatever states there are. Kept from `joint_state_counts` by triggers (same migration).
 */
export const drawingStateCounts = sqliteTable(
	'drawing_state_counts',
	{
		drawingId: integer('drawing_id')
			.primaryKey()
			.references(() => drawings.id, { onDelete: 'cascade' }),
		projectId: integer('project_id')
			.notNull()
			.references(() => projects.id, { onDelete: 'cascade' }),
		counts: text('counts', { mode: 'json' }).$type<Partial<Record<JointState, number>>>().notNull()
	},
	(t) => [index('drawing_state_counts_project').on(t.projectId, t.drawingId)]
);

export const pins = sqliteTable(
	'pins',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		jointId: integer('joint_id')
			.notNull()
			.references(() => joints.id, { onDelete: 'cascade' }),
		revisionId: integer('revision_id')
			.notNull()
			.references(() => revisions.id, { onDelete: 'cascade' }),
		pageIndex: integer('page_index').notNull(),
		/** PDF user-space points: independent of zoom, pixel ratio and page rotation. */
		x: real('x').notNull(),
		y: real('y').notNull(),
		needsReview: integer('needs_review', { mode: 'boolean' }).notNull().default(false),
		/**
		 * Why a carried pin waits for review: `moved` (its number was found elsewhere on the new
		 * sheet and the pin went there), `missing` (not found; the weld may be gone), or null.
		 */
		reviewReason: text('review_reason').$type<PinReviewReason>(),
		createdBy: text('created_by').references(() => users.id),
		createdAt: createdAt(),
		updatedAt: integer('updated_at').notNull().default(now)
	},
	(t) => [
		uniqueIndex('pins_joint_revision').on(t.jointId, t.revisionId),
		index('pins_revision_page').on(t.revisionId, t.pageIndex)
	]
);

export const welders = sqliteTable(
	'welders',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		projectId: integer('project_id')
			.notNull()
			.references(() => projects.id, { onDelete: 'cascade' }),
		stamp: text('stamp').notNull(),
		/** The stamp as compared (stampKey of $lib/domain): one welder per stamp, in any case. */
		stampKey: text('stamp_key').notNull().default(''),
		name: text('name').notNull(),
		employer: text('employer').notNull().default(''),
		status: text('status').$type<'active' | 'inactive'>().notNull().default('active'),
		createdAt: createdAt()
	},
	(t) => [
		uniqueIndex('welders_project_stamp').on(t.projectId, t.stamp),
		uniqueIndex('welders_project_stamp_key').on(t.projectId, t.stampKey)
	]
);

/** A welder's qualification for one process; continuity runs from `lastUsedOn`. */
export const welderQualifications = sqliteTable(
	'welder_qualifications',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		welderId: integer('welder_id')
			.notNull()
			.references(() => welders.id, { onDelete: 'cascade' }),
		process: text('process').notNull(),
		/** The welder performance qualification record. */
		reference: text('reference').notNull().default(''),
		qualifiedOn: text('qualified_on').notNull(),
		expiresOn: text('expires_on'),
		lastUsedOn: text('last_used_on')
	},
	(t) => [uniqueIndex('welder_qualifications_process').on(t.welderId, t.process)]
);

export const welds = sqliteTable(
	'welds',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		jointId: integer('joint_id')
			.notNull()
			.references(() => joints.id, { onDelete: 'cascade' }),
		/** 0 for the original weld, 1 for the first repair (R1) and so on. */
		repairCycle: integer('repair_cycle').notNull().default(0),
		weldedOn: text('welded_on').notNull(),
		wps: text('wps').notNull().default(''),
		process: text('process').notNull().default(''),
		/** Set when an admin let a lapsed qualification through, with the reason. */
		overrideReason: text('override_reason'),
		recordedBy: text('recorded_by').references(() => users.id),
		recordedAt: integer('recorded_at').notNull().default(now)
	},
	(t) => [uniqueIndex('welds_joint_cycle').on(t.jointId, t.repairCycle)]
);

/** Which welder's stamp is on which pass of a weld. */
export const weldWelders = sqliteTable(
	'weld_welders',
	{
		weldId: integer('weld_id')
			.notNull()
			.references(() => welds.id, { onDelete: 'cascade' }),
		welderId: integer('welder_id')
			.notNull()
			.references(() => welders.id),
		pass: text('pass').$type<WeldPass>().notNull()
	},
	(t) => [
		primaryKey({ columns: [t.weldId, t.welderId, t.pass] }),
		index('weld_welders_welder').on(t.welderId)
	]
);

export const inspections = sqliteTable(
	'inspections',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		jointId: integer('joint_id')
			.notNull()
			.references(() => joints.id, { onDelete: 'cascade' }),
		stage: text('stage').$type<InspectionStage>().notNull(),
		method: text('method').$type<NdeMethod>(),
		repairCycle: integer('repair_cycle').notNull().default(0),
		readings: text('readings', { mode: 'json' }).$type<StoredReading[]>().notNull().default([]),
		verdict: text('verdict').$type<Verdict>(),
		findings: text('findings', { mode: 'json' }).$type<StoredFinding[]>().notNull().default([]),
		criteriaSetId: text('criteria_set_id'),
		criteriaSetVersion: integer('criteria_set_version'),
		decision: text('decision').$type<Decision>().notNull(),
		reason: text('reason'),
		/** True when the decision goes against the verdict; shown wherever the record shows. */
		againstVerdict: integer('against_verdict', { mode: 'boolean' }).notNull().default(false),
		reportNo: text('report_no'),
		technician: text('technician'),
		inspectorId: text('inspector_id')
			.notNull()
			.references(() => users.id),
		inspectedAt: integer('inspected_at').notNull().default(now),
		supersedesId: integer('supersedes_id').references((): AnySQLiteColumn => inspections.id)
	},
	(t) => [
		index('inspections_joint').on(t.jointId, t.stage, t.inspectedAt),
		index('inspections_inspector').on(t.inspectorId, t.inspectedAt),
		index('inspections_time').on(t.inspectedAt),
		// "Is this row corrected by a later one?" is asked for every row the weld log shows.
		index('inspections_supersedes').on(t.supersedesId),
		// The few decisions against the verdict, found without reading every record.
		index('inspections_against_verdict').on(t.jointId).where(sql.raw('"against_verdict" = 1'))
	]
);

/**
 * A photo attached to an inspection record, as re-encoded by the server (JPEG, no metadata
 * unless the project keeps location) with a small WebP thumbnail beside it in storage.
 */
export const photos = sqliteTable(
	'photos',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		inspectionId: integer('inspection_id')
			.notNull()
			.references(() => inspections.id, { onDelete: 'cascade' }),
		/** Storage key of the image; the thumbnail is the same key with `.thumb.webp`. */
		storageKey: text('storage_key').notNull(),
		sha256: text('sha256').notNull(),
		bytes: integer('bytes').notNull(),
		width: integer('width').notNull(),
		height: integer('height').notNull(),
		thumbBytes: integer('thumb_bytes').notNull(),
		caption: text('caption').notNull().default(''),
		keptLocation: integer('kept_location', { mode: 'boolean' }).notNull().default(false),
		uploadedBy: text('uploaded_by')
			.notNull()
			.references(() => users.id),
		createdAt: createdAt()
	},
	(t) => [index('photos_inspection').on(t.inspectionId, t.createdAt)]
);

/** A hold point called by the foreman: one row per joint, grouped by batch. */
export const inspectionRequests = sqliteTable(
	'inspection_requests',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		projectId: integer('project_id')
			.notNull()
			.references(() => projects.id, { onDelete: 'cascade' }),
		batch: text('batch').notNull(),
		jointId: integer('joint_id')
			.notNull()
			.references(() => joints.id, { onDelete: 'cascade' }),
		stage: text('stage').$type<InspectionStage>().notNull(),
		note: text('note').notNull().default(''),
		requestedBy: text('requested_by').references(() => users.id),
		requestedAt: integer('requested_at').notNull().default(now),
		closedAt: integer('closed_at'),
		closedByInspectionId: integer('closed_by_inspection_id').references(() => inspections.id)
	},
	(t) => [
		index('inspection_requests_open').on(t.projectId, t.closedAt, t.requestedAt),
		index('inspection_requests_joint').on(t.jointId)
	]
);

// NDE lots and sampling (src/lib/server/nde.ts) ------------------------------------------

/**
 * A lot: welds of one grouping (a line, a system, a week …) sampled together by one method at
 * one extent. Open while it can still receive welds; the QC manager closes it, and a weld of
 * the same grouping welded later starts the next lot (`seq` + 1).
 */
export const ndeLots = sqliteTable(
	'nde_lots',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		projectId: integer('project_id')
			.notNull()
			.references(() => projects.id, { onDelete: 'cascade' }),
		method: text('method').$type<NdeMethod>().notNull(),
		percent: real('percent').notNull(),
		/** Kinds of weld the extent covers, e.g. `butt` or `butt,branch`. */
		kinds: text('kinds').notNull(),
		groupBy: text('group_by').$type<LotGrouping>().notNull(),
		groupKey: text('group_key').notNull(),
		seq: integer('seq').notNull().default(1),
		label: text('label').notNull(),
		everyWelder: integer('every_welder', { mode: 'boolean' }).notNull().default(true),
		status: text('status').$type<'open' | 'closed'>().notNull().default('open'),
		/** Where the lot stood at its last change (src/lib/nde/sampling.ts), for filtering lists. */
		stage: text('stage').$type<LotStage>().notNull().default('open'),
		createdAt: createdAt(),
		closedBy: text('closed_by').references(() => users.id),
		closedAt: integer('closed_at'),
		closeNote: text('close_note')
	},
	(t) => [
		uniqueIndex('nde_lots_key').on(
			t.projectId,
			t.method,
			t.percent,
			t.kinds,
			t.groupBy,
			t.groupKey,
			t.seq
		),
		index('nde_lots_project_status').on(t.projectId, t.status, t.label),
		index('nde_lots_project_stage').on(t.projectId, t.stage, t.label)
	]
);

/** A weld in a lot, from the moment its original weld is recorded. */
export const ndeLotJoints = sqliteTable(
	'nde_lot_joints',
	{
		lotId: integer('lot_id')
			.notNull()
			.references(() => ndeLots.id, { onDelete: 'cascade' }),
		jointId: integer('joint_id')
			.notNull()
			.references(() => joints.id, { onDelete: 'cascade' }),
		/** When the original weld was recorded: an examination before it cannot accept it. */
		weldedAt: integer('welded_at').notNull(),
		addedAt: integer('added_at').notNull().default(now)
	},
	(t) => [
		primaryKey({ columns: [t.lotId, t.jointId] }),
		index('nde_lot_joints_joint').on(t.jointId, t.lotId)
	]
);

/** One selection drawn in a lot, with the seed that draws it again from the same candidates. */
export const ndeRounds = sqliteTable(
	'nde_rounds',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		lotId: integer('lot_id')
			.notNull()
			.references(() => ndeLots.id, { onDelete: 'cascade' }),
		/** Null for selections recorded before lots were kept. */
		seed: integer('seed'),
		/** The lot as it stood: welds, sample size asked, and candidates drawn from. */
		joints: integer('joints').notNull(),
		required: integer('required').notNull(),
		candidates: integer('candidates').notNull(),
		committedBy: text('committed_by').references(() => users.id),
		committedAt: integer('committed_at').notNull().default(now)
	},
	(t) => [index('nde_rounds_lot').on(t.lotId, t.committedAt)]
);

/**
 * A joint chosen for NDE: a random draw in its lot (or a swap for one, or the client's pick),
 * a tracer called by a reject, all of a welder's work at 100 %, or a requirement. Never
 * deleted: a swap cancels the row it replaces, with the reason.
 */
export const ndeSelections = sqliteTable(
	'nde_selections',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		projectId: integer('project_id')
			.notNull()
			.references(() => projects.id, { onDelete: 'cascade' }),
		jointId: integer('joint_id')
			.notNull()
			.references(() => joints.id, { onDelete: 'cascade' }),
		method: text('method').$type<NdeMethod>().notNull(),
		/** The lot's label as it was when selected (kept for selections made before lots). */
		lot: text('lot').notNull().default(''),
		reason: text('reason').$type<SelectionReason>().notNull(),
		tracerOfJointId: integer('tracer_of_joint_id').references(() => joints.id),
		selectedBy: text('selected_by').references(() => users.id),
		selectedAt: integer('selected_at').notNull().default(now),
		cancelledAt: integer('cancelled_at'),
		lotId: integer('lot_id').references(() => ndeLots.id, { onDelete: 'cascade' }),
		roundId: integer('round_id').references(() => ndeRounds.id),
		/** 0 the sample, 1 and 2 tracers, 3 all of a welder's work (ASME B31.3 341.3.4). */
		level: integer('level').notNull().default(0),
		/** Whose work a tracer or a 100 % selection examines. */
		welderId: integer('welder_id').references(() => welders.id),
		/** The selection whose reject called this one. */
		tracerOfId: integer('tracer_of_id').references((): AnySQLiteColumn => ndeSelections.id),
		/** The selection this one replaced: a swap, or the weld a cut-out replaced. */
		replacesId: integer('replaces_id').references((): AnySQLiteColumn => ndeSelections.id),
		/** Carried to a cut-out's replacement: a failure of it calls no tracers (341.3.4(f)). */
		carried: integer('carried', { mode: 'boolean' }).notNull().default(false),
		/** Why it was swapped in, or why it was cancelled. */
		note: text('note'),
		cancelledBy: text('cancelled_by').references(() => users.id)
	},
	(t) => [
		index('nde_selections_joint').on(t.jointId),
		index('nde_selections_project_lot').on(t.projectId, t.lot),
		index('nde_selections_lot').on(t.lotId, t.cancelledAt)
	]
);

/** The tracers (or 100 %) a reject called for one welder, and how many the lot could not give. */
export const ndeTracerCalls = sqliteTable(
	'nde_tracer_calls',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		lotId: integer('lot_id')
			.notNull()
			.references(() => ndeLots.id, { onDelete: 'cascade' }),
		selectionId: integer('selection_id')
			.notNull()
			.references(() => ndeSelections.id, { onDelete: 'cascade' }),
		inspectionId: integer('inspection_id').references(() => inspections.id),
		welderId: integer('welder_id')
			.notNull()
			.references(() => welders.id),
		level: integer('level').notNull(),
		wanted: integer('wanted').notNull(),
		short: integer('short').notNull().default(0),
		calledAt: integer('called_at').notNull().default(now),
		/** Set when the reject that called them was corrected to an accept. */
		withdrawnAt: integer('withdrawn_at')
	},
	(t) => [
		index('nde_tracer_calls_lot').on(t.lotId),
		index('nde_tracer_calls_selection').on(t.selectionId)
	]
);

/** A request for examination sent to the NDE contractor, closed by the results. */
export const ndeRequests = sqliteTable(
	'nde_requests',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		projectId: integer('project_id')
			.notNull()
			.references(() => projects.id, { onDelete: 'cascade' }),
		sentTo: text('sent_to').notNull(),
		note: text('note').notNull().default(''),
		sentBy: text('sent_by').references(() => users.id),
		sentAt: integer('sent_at').notNull().default(now),
		closedAt: integer('closed_at')
	},
	(t) => [index('nde_requests_project').on(t.projectId, t.sentAt)]
);

/** One weld on a request: its selection, at the repair cycle it was asked for. */
export const ndeRequestItems = sqliteTable(
	'nde_request_items',
	{
		requestId: integer('request_id')
			.notNull()
			.references(() => ndeRequests.id, { onDelete: 'cascade' }),
		selectionId: integer('selection_id')
			.notNull()
			.references(() => ndeSelections.id, { onDelete: 'cascade' }),
		repairCycle: integer('repair_cycle').notNull().default(0),
		inspectionId: integer('inspection_id').references(() => inspections.id)
	},
	(t) => [
		primaryKey({ columns: [t.selectionId, t.repairCycle] }),
		index('nde_request_items_request').on(t.requestId)
	]
);

/**
 * An indication an RT or UT report names, kept with the result as the acceptance engine read
 * it (src/lib/acceptance/indications.ts): its type, each dimension as typed and in mm, and
 * whether the engine's judgement of it, by the joint's criteria set, was a reject.
 */
export const ndeIndications = sqliteTable(
	'nde_indications',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		inspectionId: integer('inspection_id')
			.notNull()
			.references(() => inspections.id, { onDelete: 'cascade' }),
		/** The engine's indication type, e.g. `incompletePenetration`. */
		type: text('type').$type<IndicationType>().notNull(),
		lengthText: text('length_text').notNull().default(''),
		lengthMm: real('length_mm'),
		widthText: text('width_text').notNull().default(''),
		widthMm: real('width_mm'),
		depthText: text('depth_text').notNull().default(''),
		depthMm: real('depth_mm'),
		/** Start of the indication along the weld from the report's datum. */
		positionText: text('position_text').notNull().default(''),
		positionMm: real('position_mm'),
		/** RT: the image darker than the thinnest adjacent parent metal. */
		darker: integer('darker', { mode: 'boolean' }),
		/** The engine's worst outcome on it (within, outside, judge); null where no limit reads it. */
		outcome: text('outcome').$type<Verdict>(),
		/** A reason for the reject: a finding on it (or on its kind together) the engine rejects. */
		rejected: integer('rejected', { mode: 'boolean' }).notNull().default(false)
	},
	(t) => [index('nde_indications_inspection').on(t.inspectionId)]
);

/** The last weld each project's lots were formed from, so forming them again reads only new welds. */
export const ndeLotMarks = sqliteTable('nde_lot_marks', {
	projectId: integer('project_id')
		.primaryKey()
		.references(() => projects.id, { onDelete: 'cascade' }),
	weldId: integer('weld_id').notNull().default(0)
});

export type NdeLot = typeof ndeLots.$inferSelect;
export type NdeSelection = typeof ndeSelections.$inferSelect;

export const exports = sqliteTable(
	'exports',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		projectId: integer('project_id')
			.notNull()
			.references(() => projects.id, { onDelete: 'cascade' }),
		scope: text('scope', { mode: 'json' }).$type<Record<string, unknown>>().notNull(),
		/** A digest of scope and options: a second identical job is refused while one runs. */
		scopeKey: text('scope_key').notNull(),
		status: text('status')
			.$type<'queued' | 'running' | 'done' | 'failed' | 'cancelled'>()
			.notNull()
			.default('queued'),
		progress: real('progress').notNull().default(0),
		current: text('current'),
		report: text('report', { mode: 'json' }).$type<string[]>().notNull().default([]),
		fileKey: text('file_key'),
		bytes: integer('bytes'),
		sha256: text('sha256'),
		requestedBy: text('requested_by').references(() => users.id),
		createdAt: createdAt(),
		startedAt: integer('started_at'),
		finishedAt: integer('finished_at')
	},
	(t) => [
		index('exports_project').on(t.projectId, t.createdAt),
		index('exports_key').on(t.scopeKey, t.status)
	]
);

/** Who changed what, when: before and after for every change. */
export const auditEvents = sqliteTable(
	'audit_events',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		at: integer('at').notNull().default(now),
		userId: text('user_id').references(() => users.id),
		/** For sign-in attempts by an address that may not exist. */
		actorEmail: text('actor_email'),
		projectId: integer('project_id').references(() => projects.id, { onDelete: 'cascade' }),
		action: text('action').notNull(),
		entity: text('entity').notNull(),
		entityId: text('entity_id'),
		before: text('before', { mode: 'json' }).$type<unknown>(),
		after: text('after', { mode: 'json' }).$type<unknown>(),
		ip: text('ip')
	},
	(t) => [
		index('audit_project_time').on(t.projectId, t.at),
		index('audit_entity').on(t.entity, t.entityId),
		index('audit_user_time').on(t.userId, t.at)
	]
);

/**
 * A write sent with an `Idempotency-Key`, per user: the request it came with (hash of method,
 * path and body) and the answer it got. The key is claimed inside the write's own transaction,
 * so a stored record and its key commit together; `status` is null until the answer is known.
 */
export const idempotencyKeys = sqliteTable(
	'idempotency_keys',
	{
		userId: text('user_id')
			.notNull()
			.references(() => users.id, { onDelete: 'cascade' }),
		key: text('key').notNull(),
		requestHash: text('request_hash').notNull(),
		method: text('method').notNull(),
		path: text('path').notNull(),
		status: integer('status'),
		contentType: text('content_type'),
		body: text('body'),
		createdAt: createdAt()
	},
	(t) => [
		primaryKey({ columns: [t.userId, t.key] }),
		index('idempotency_keys_time').on(t.createdAt)
	]
);

/** What the local stand-in SMTP server received, for the admin's mail page. */
export const mailMessages = sqliteTable(
	'mail_messages',
	{
		id: integer('id').primaryKey({ autoIncrement: true }),
		receivedAt: integer('received_at').notNull().default(now),
		from: text('from').notNull(),
		to: text('to').notNull(),
		subject: text('subject').notNull(),
		text: text('text').notNull().default(''),
		html: text('html'),
		messageId: text('message_id')
	},
	(t) => [index('mail_messages_to').on(t.to, t.receivedAt)]
);

export type User = typeof users.$inferSelect;
export type Project = typeof projects.$inferSelect;
export type CriteriaSetRow = typeof criteriaSets.$inferSelect;
export type Membership = typeof memberships.$inferSelect;
export type Drawing = typeof drawings.$inferSelect;
export type Revision = typeof revisions.$inferSelect;
export type Page = typeof pages.$inferSelect;
export type Joint = typeof joints.$inferSelect;
export type WpsRow = typeof wps.$inferSelect;
export type Pin = typeof pins.$inferSelect;
export type Weld = typeof welds.$inferSelect;
export type Welder = typeof welders.$inferSelect;
export type Inspection = typeof inspections.$inferSelect;
export type Photo = typeof photos.$inferSelect;
export type AuditEvent = typeof auditEvents.$inferSelect;
