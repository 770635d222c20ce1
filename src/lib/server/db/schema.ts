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
import type { CheckId, Finding } from '../../acceptance/types';
import type { LimitOverride } from '../../acceptance/derive';
import type { TileFormat, TileLevel, TileStatus } from '../../sheet-tiles';

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

export interface NdeLotRule {
	/** How a lot is formed, agreed before work starts. */
	groupBy: 'line' | 'system' | 'drawing' | 'week';
	/** Random examination extent per method, in percent of joints in the lot. */
	percent: Partial<Record<NdeMethod, number>>;
	/** Every welder with joints in the lot is represented in the sample. */
	everyWelder: boolean;
}

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
		wps: text('wps').notNull().default(''),
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

/** A joint chosen for NDE: by lot sampling, as a tracer for a reject, or by the client. */
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
		lot: text('lot').notNull().default(''),
		reason: text('reason').$type<'random' | 'tracer' | 'client' | 'required'>().notNull(),
		tracerOfJointId: integer('tracer_of_joint_id').references(() => joints.id),
		selectedBy: text('selected_by').references(() => users.id),
		selectedAt: integer('selected_at').notNull().default(now),
		cancelledAt: integer('cancelled_at')
	},
	(t) => [
		index('nde_selections_joint').on(t.jointId),
		index('nde_selections_project_lot').on(t.projectId, t.lot)
	]
);

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
export type Pin = typeof pins.$inferSelect;
export type Weld = typeof welds.$inferSelect;
export type Welder = typeof welders.$inferSelect;
export type Inspection = typeof inspections.$inferSelect;
export type Photo = typeof photos.$inferSelect;
export type AuditEvent = typeof auditEvents.$inferSelect;
