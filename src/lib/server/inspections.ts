/**
 * Inspection records: fit-up, visual and NDE results signed by an inspector. Readings are kept
 * as typed and in mm or degrees, and judged again here by the acceptance engine: the stored
 * verdict is the server's, never the client's. Append-only: a correction is a new row that
 * names the row it supersedes, and both stay in the history.
 */
import { and, desc, eq } from 'drizzle-orm';
import { db, schema } from './db';
import * as audit from './audit';
import * as criteriaSets from './criteria-sets';
import * as events from './events';
import * as inspectionRequests from './inspection-requests';
import * as ndeLots from './nde';
import { JointError, refreshState, row, stateInput } from './joints';
import {
	evaluate,
	getCriteriaSet,
	isReadingId,
	readingDefinitions,
	type CriteriaSet,
	type JointInput,
	type ReadingsInput,
	type Stage
} from '$lib/acceptance';
import {
	deriveJointState,
	displayWeldNumber,
	effectiveInspections,
	STATE_LOOKS,
	type DerivedState,
	type StateInput
} from '$lib/joint-state';
import { parseAngle, parseLength, type UnitSystem } from '$lib/units';
import type { RecordInspection } from '$lib/schemas/inspection';
import type { Inspection, Joint, StoredReading } from './db/schema';

/** Readings by id: as typed, a number in mm or degrees, or yes/no; blank means not given. */
export type ReadingTexts = ReadingsInput;

const YES = ['yes', 'y', 'true'];
const NO = ['no', 'n', 'false'];

const isBlank = (value: unknown): value is null | undefined | '' =>
	value == null || (typeof value === 'string' && value.trim() === '');

/** Each reading with the text as typed and its value, as an inspection row keeps it. */
export function storedReadings(texts: ReadingTexts, units: UnitSystem): StoredReading[] {
	const stored: StoredReading[] = [];
	for (const [id, raw] of Object.entries(texts)) {
		if (!isReadingId(id) || isBlank(raw)) continue;
		const definition = readingDefinitions[id];
		if (definition.kind === 'boolean') {
			const answer = typeof raw === 'string' ? raw.trim().toLowerCase() : raw;
			const flag = YES.includes(String(answer)) ? true : NO.includes(String(answer)) ? false : null;
			stored.push({
				id,
				text: typeof raw === 'boolean' ? (raw ? 'yes' : 'no') : String(raw),
				value: flag,
				unit: flag === null ? null : 'bool'
			});
			continue;
		}
		if (typeof raw === 'boolean') {
			stored.push({ id, text: raw ? 'yes' : 'no', value: null, unit: null });
			continue;
		}
		const angle = definition.kind === 'angle';
		const parsed = angle
			? parseAngle(raw, { reading: definition.id })
			: parseLength(raw, { units, reading: definition.id });
		// A JSON number is already mm or degrees; the unit goes into the text so that it reads
		// the same in an inch project, where a bare "1.6" would mean inches.
		const text = typeof raw === 'number' ? `${raw}${angle ? '°' : ' mm'}` : raw;
		stored.push(
			parsed.ok
				? { id, text, value: parsed.value, unit: angle ? 'deg' : 'mm' }
				: { id, text, value: null, unit: null }
		);
	}
	return stored;
}

function unknownCriteriaSet(criteriaSetId: string): JointError {
	return new JointError(
		`The joint's criteria set "${criteriaSetId}" is neither a built-in set nor one of the project's own; choose a criteria set on the joint card first.`,
		409,
		'criteriaSetId'
	);
}

/** The limits a verdict was judged by: the code and edition, or the project's own set of them. */
function criteriaWords(set: CriteriaSet): string {
	const code = `${set.standard} ${set.edition}`;
	return set.basedOn ? `${set.name} (version ${set.version}, from ${code})` : code;
}

/**
 * The engine's verdict on a set of readings, in the shape an inspection row stores: by a set,
 * or a built-in set named by its id. An unreadable reading is a JointError 400 naming the
 * field (`readings.undercutDepth`).
 */
export function judgeReadings(
	criteria: string | CriteriaSet,
	joint: JointInput,
	stage: Stage,
	texts: ReadingTexts,
	units: UnitSystem
) {
	const set = typeof criteria === 'string' ? getCriteriaSet(criteria) : criteria;
	if (!set) throw unknownCriteriaSet(criteria as string);
	const result = evaluate(set, joint, stage, texts, { units });
	if (!result.ok) {
		const [first] = result.errors;
		throw new JointError(first.message, 400, first.field);
	}
	return {
		readings: storedReadings(texts, units),
		verdict: result.verdict,
		findings: result.findings,
		version: result.criteria.version
	};
}

// Reading -------------------------------------------------------------------------------

const i = schema.inspections;

/** The joint's inspections, newest first, with the inspector's name and any later correction. */
export function list(jointId: number) {
	const rows = db
		.select({
			inspection: i,
			inspector: schema.users.name,
			inspectorEmail: schema.users.email
		})
		.from(i)
		.innerJoin(schema.users, eq(schema.users.id, i.inspectorId))
		.where(eq(i.jointId, jointId))
		.orderBy(desc(i.inspectedAt), desc(i.id))
		.all();
	const correctedBy = new Map<number, number>();
	for (const { inspection } of rows) {
		if (inspection.supersedesId != null) correctedBy.set(inspection.supersedesId, inspection.id);
	}
	return rows.map(({ inspection, inspector, inspectorEmail }) => ({
		...inspection,
		inspector: inspector ?? inspectorEmail,
		supersededById: correctedBy.get(inspection.id) ?? null
	}));
}

// Writing -------------------------------------------------------------------------------

type Tx = Parameters<Parameters<typeof db.transaction>[0]>[0];
type Row = StateInput['inspections'][number];

const STAGE_NAMES = { fitup: 'fit-up', visual: 'visual', nde: 'NDE' } as const;

function stageName(stage: Row['stage'], method?: string | null): string {
	return stage === 'nde' && method ? method : STAGE_NAMES[stage];
}

function dateOf(ms: number): string {
	return new Date(ms).toISOString().slice(0, 10);
}

/**
 * Fit-up before welding, visual once welded, NDE after an accepted visual, all of the current
 * repair cycle; one result per stage (per method for NDE) and cycle unless it is a correction.
 */
function checkStageOrder(
	tx: Tx,
	joint: Joint,
	input: RecordInspection,
	state: StateInput,
	derived: DerivedState,
	correcting: Inspection | undefined
) {
	const label = displayWeldNumber(joint.number, derived.repairCycle);
	const welded = state.welds.length > 0;
	const cycle = derived.repairCycle;
	if (input.stage === 'fitup') {
		if (welded) {
			throw new JointError(
				correcting
					? `Joint ${label} has been welded since that fit-up record; it stands as it was, and the weld's own inspections follow.`
					: `Joint ${label} is already welded (${STATE_LOOKS[derived.state].label.toLowerCase()}); fit-up is inspected before welding. Record a visual inspection of the weld instead.`,
				409,
				'stage'
			);
		}
		return;
	}
	if (!welded) {
		const next =
			derived.state === 'ready_to_weld'
				? 'the foreman records the weld with the welder stamps first'
				: 'its fit-up must be accepted and the weld recorded first';
		throw new JointError(
			`Joint ${label} has not been welded yet: ${next}, then the ${stageName(input.stage, input.method)} result can be recorded.`,
			409,
			'stage'
		);
	}
	const rows = effectiveInspections(state.inspections).filter(
		(r) => r.repairCycle === cycle && r.id !== correcting?.id
	);
	const previous = (match: (r: Row) => boolean) => rows.filter(match).at(-1);
	const describe = (r: Row) => {
		const record = tx
			.select({ at: i.inspectedAt, by: schema.users.name })
			.from(i)
			.innerJoin(schema.users, eq(schema.users.id, i.inspectorId))
			.where(eq(i.id, r.id))
			.get();
		return `#${r.id}, ${r.decision}${record ? `, ${record.by ?? 'inspector'} on ${dateOf(record.at)}` : ''}`;
	};
	const visual = previous((r) => r.stage === 'visual');
	if (input.stage === 'visual') {
		if (visual) {
			const then =
				visual.decision === 'reject'
					? ` It was rejected: the repair weld (${displayWeldNumber(joint.number, cycle + 1)}) comes next, and its own visual after it.`
					: '';
			throw new JointError(
				`Weld ${label} already has a visual result (${describe(visual)}).${then} To change that result, record a correction that supersedes it.`,
				409,
				'stage'
			);
		}
		return;
	}
	if (!visual || visual.decision !== 'accept') {
		throw new JointError(
			visual
				? `The visual inspection of weld ${label} was rejected (${describe(visual)}): the weld is repaired before any NDE.`
				: `Weld ${label} has no accepted visual inspection yet: NDE comes after the visual is accepted.`,
			409,
			'stage'
		);
	}
	const method = input.method!;
	if (!state.ndeMethods.includes(method)) {
		const asked = state.ndeMethods.length ? state.ndeMethods.join(', ') : 'none';
		throw new JointError(
			`${method} is not asked of joint ${label} (required or selected: ${asked}). Select the joint for ${method} first, so the result counts toward its state.`,
			409,
			'method'
		);
	}
	const nde = previous((r) => r.stage === 'nde' && r.method === method);
	if (nde) {
		throw new JointError(
			`Weld ${label} already has a ${method} result (${describe(nde)}). To change it, record a correction that supersedes it.`,
			409,
			'stage'
		);
	}
}

/** The row a correction replaces: same joint, same stage and method, not yet corrected. */
function supersededRow(tx: Tx, joint: Joint, input: RecordInspection, derived: DerivedState) {
	const id = input.supersedes!;
	const old = tx.select().from(i).where(eq(i.id, id)).get();
	if (!old || old.jointId !== joint.id) {
		throw new JointError(
			`Inspection #${id} is not a record of joint ${joint.number}.`,
			400,
			'supersedes'
		);
	}
	if (old.stage !== input.stage || (old.stage === 'nde' && old.method !== input.method)) {
		throw new JointError(
			`Inspection #${id} is a ${stageName(old.stage, old.method)} record; a correction keeps the stage${old.method ? ' and method' : ''} of the record it replaces.`,
			400,
			'supersedes'
		);
	}
	const later = tx
		.select({ id: i.id })
		.from(i)
		.where(and(eq(i.jointId, joint.id), eq(i.supersedesId, id)))
		.get();
	if (later) {
		throw new JointError(
			`Inspection #${id} has already been corrected by #${later.id}; correct #${later.id} instead.`,
			409,
			'supersedes'
		);
	}
	if (old.stage !== 'fitup' && old.repairCycle !== derived.repairCycle) {
		throw new JointError(
			`Inspection #${id} belongs to weld ${displayWeldNumber(joint.number, old.repairCycle)}; the joint has since been repaired (${displayWeldNumber(joint.number, derived.repairCycle)}), so that record stands as it was.`,
			409,
			'supersedes'
		);
	}
	return old;
}

function projectUnits(tx: Tx, projectId: number): UnitSystem {
	return (
		tx
			.select({ units: schema.projects.units })
			.from(schema.projects)
			.where(eq(schema.projects.id, projectId))
			.get()?.units ?? 'imperial'
	);
}

function jointInput(joint: Joint): JointInput {
	return {
		kind: joint.kind,
		thickness: joint.thicknessMm ?? undefined,
		requiredSize: joint.requiredSizeMm ?? undefined
	};
}

/** What the record says of the verdict: the engine's, its findings, and the set it used. */
function judged(tx: Tx, joint: Joint, input: RecordInspection) {
	if (input.stage === 'nde') {
		// The engine has no NDE criteria: the result is the report's, signed by the inspector.
		return {
			readings: [],
			verdict: null,
			findings: [],
			criteriaSetId: null,
			criteriaSetVersion: null,
			set: undefined
		};
	}
	// A project set at its latest version; the row keeps that version beside the set's id.
	const set = criteriaSets.resolve(joint.projectId, joint.criteriaSetId, undefined, tx);
	if (!set) throw unknownCriteriaSet(joint.criteriaSetId);
	const result = judgeReadings(
		set,
		jointInput(joint),
		input.stage,
		input.readings,
		projectUnits(tx, joint.projectId)
	);
	return {
		readings: result.readings,
		verdict: result.verdict,
		findings: result.findings,
		criteriaSetId: joint.criteriaSetId,
		criteriaSetVersion: result.version,
		set
	};
}

/** The joint as a record answer shows it. */
export function jointSummary(joint: Joint) {
	return {
		id: joint.id,
		number: joint.number,
		label: displayWeldNumber(joint.number, joint.repairCycle),
		state: joint.state,
		stateLabel: STATE_LOOKS[joint.state].label,
		repairCycle: joint.repairCycle,
		version: joint.version
	};
}

/**
 * Record an inspection result on a joint, signed by the inspector, in one transaction with
 * the joint's state and version. Expected failures are JointErrors: 400 for input that cannot
 * be read or a missing reason, 404 for no joint, 409 for a step out of order.
 */
export function record(jointId: number, input: RecordInspection, inspectorId: string) {
	return db.transaction((tx) => {
		const joint = row(jointId, tx);
		if (!joint) throw new JointError('There is no such joint.', 404);
		if (input.version !== undefined && input.version !== joint.version) {
			throw new JointError(
				`Someone else changed joint ${joint.number} a moment ago (version ${joint.version}, yours ${input.version}). Reload it and check before recording.`,
				409,
				'version'
			);
		}
		if (joint.voidedAt) {
			throw new JointError(
				`Joint ${joint.number} is void (${joint.voidReason ?? 'voided'}); nothing more is recorded on it.`,
				409
			);
		}
		const state = stateInput(jointId, tx)!;
		const derived = deriveJointState(state);
		const correcting =
			input.supersedes !== undefined ? supersededRow(tx, joint, input, derived) : undefined;
		checkStageOrder(tx, joint, input, state, derived, correcting);

		const reason = input.reason?.trim() || null;
		if (correcting && (reason === null || reason.length < 3)) {
			throw new JointError(
				`Say why inspection #${correcting.id} is corrected (e.g. "re-gauged: undercut was misread"); the reason stays with the record.`,
				400,
				'reason'
			);
		}
		const verdict = judged(tx, joint, input);
		const againstVerdict =
			(input.decision === 'accept' && verdict.verdict === 'outside') ||
			(input.decision === 'reject' && verdict.verdict === 'within');
		if (againstVerdict && (reason === null || reason.length < 3)) {
			const standard = verdict.set ? criteriaWords(verdict.set) : 'the code';
			throw new JointError(
				verdict.verdict === 'outside'
					? `The readings are outside the limits of ${standard}. To accept anyway, write the reason; the record is flagged as a decision against the verdict.`
					: `The readings are within the limits of ${standard}. To reject anyway, write the reason; the record is flagged as a decision against the verdict.`,
				400,
				'reason'
			);
		}

		const now = Date.now();
		const inspection = tx
			.insert(i)
			.values({
				jointId,
				stage: input.stage,
				method: input.stage === 'nde' ? input.method : null,
				repairCycle: correcting?.repairCycle ?? derived.repairCycle,
				readings: verdict.readings,
				verdict: verdict.verdict,
				findings: verdict.findings,
				criteriaSetId: verdict.criteriaSetId,
				criteriaSetVersion: verdict.criteriaSetVersion,
				decision: input.decision,
				reason,
				againstVerdict,
				reportNo: input.reportNo || null,
				technician: input.technician || null,
				inspectorId,
				inspectedAt: now,
				supersedesId: correcting?.id ?? null
			})
			.returning()
			.get();
		tx.update(schema.joints)
			.set({ version: joint.version + 1, updatedAt: now })
			.where(eq(schema.joints.id, jointId))
			.run();
		const after = refreshState(jointId, tx, now)!;
		// The hold point the foreman called for this stage is released by this very record,
		// in the same transaction, so the board never shows one without the other.
		inspectionRequests.closeByInspection(tx, jointId, input.stage, inspection.id, now);
		// NDE lots: the report's indications, the request it answers, the tracers a reject calls.
		const nde = ndeLots.afterResult(tx, {
			inspection,
			joint,
			extras: { indications: input.indications, welders: input.welders },
			units: projectUnits(tx, joint.projectId),
			userId: inspectorId
		});
		audit.record(
			{
				action: correcting ? 'inspection_correct' : 'inspection',
				entity: 'joint',
				entityId: jointId,
				projectId: joint.projectId,
				userId: inspectorId,
				at: now,
				before: { state: joint.state, repairCycle: joint.repairCycle },
				after: {
					inspectionId: inspection.id,
					stage: inspection.stage,
					method: inspection.method,
					repairCycle: inspection.repairCycle,
					decision: inspection.decision,
					verdict: inspection.verdict,
					againstVerdict,
					reason,
					supersedes: inspection.supersedesId,
					state: after.state
				}
			},
			tx
		);
		events.publish(joint.projectId, {
			type: 'joint',
			action: 'recorded',
			jointId,
			drawingId: joint.drawingId,
			by: inspectorId
		});
		return { inspection, joint: jointSummary(row(jointId, tx)!), nde };
	});
}
