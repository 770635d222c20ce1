/**
 * Inspection records: fit-up, visual and NDE results signed by an inspector. Readings are kept
 * as typed and in mm or degrees, and judged again here by the acceptance engine: the stored
 * verdict is the server's, never the client's. Append-only: a correction is a new row that
 * names the row it supersedes, and both stay in the history.
 */
import { asc, desc, eq, sql, type SQL } from 'drizzle-orm';
import type { AnySQLiteColumn } from 'drizzle-orm/sqlite-core';
import { db, schema } from './db';
import * as audit from './audit';
import * as wpsRegister from './wps';
import { jointDesign } from '$lib/wps-register';
import type { WpsJointDesign } from '$lib/acceptance/types';
import * as projects from './projects';
import * as criteriaSets from './criteria-sets';
import * as events from './events';
import * as inspectionRequests from './inspection-requests';
import * as ndeLots from './nde';
import { DomainError, refuse } from './errors';
import { lockedJoint, refreshState, row, stateInput } from './joints';
import {
	evaluate,
	getCriteriaSet,
	jointInputOf,
	type CriteriaSet,
	type JointInput,
	type ReadingsInput,
	type Stage
} from '$lib/acceptance';
import { correctionRequestRefusal } from '$lib/corrections';
import { isAgainstVerdict, isReasonGiven } from '$lib/domain';
import { correctionsOf, deriveJointState, displayWeldNumber, STATE_LOOKS } from '$lib/joint-state';
import { stageOrderRefusal } from '$lib/stage-order';
import type { UnitSystem } from '$lib/units';
import type { RecordInspection } from '$lib/schemas/inspection';
import type { Joint } from './db/schema';

/** Readings by id: as typed, a number in mm or degrees, or yes/no; blank means not given. */
export type ReadingTexts = ReadingsInput;

function unknownCriteriaSet(criteriaSetId: string): DomainError {
	return new DomainError(
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
 * or a built-in set named by its id. An unreadable reading is a DomainError 400 naming the
 * field (`readings.undercutDepth`).
 */
export function judgeReadings(
	criteria: string | CriteriaSet,
	joint: JointInput,
	stage: Stage,
	texts: ReadingTexts,
	units: UnitSystem,
	wps?: WpsJointDesign
) {
	const set = typeof criteria === 'string' ? getCriteriaSet(criteria) : criteria;
	if (!set) throw unknownCriteriaSet(criteria as string);
	const result = evaluate(set, joint, stage, texts, { units, wps });
	if (!result.ok) {
		const [first] = result.errors;
		throw new DomainError(first.message, 400, first.field);
	}
	return {
		readings: result.readings,
		verdict: result.verdict,
		findings: result.findings,
		version: result.criteria.version
	};
}

// Reading -------------------------------------------------------------------------------

const i = schema.inspections;

/**
 * In SQL, the records that stand: those no later record corrects. The same set as
 * `effectiveInspections` of $lib/joint-state keeps (which also puts each correction in the
 * place of the row it corrects); a filter that only asks "does a standing record say …"
 * reads it here, and anything that needs the order reads the rule itself.
 */
export function standingSql(id: SQL | AnySQLiteColumn = i.id): SQL {
	return sql`not exists (select 1 from ${i} as later where later.supersedes_id = ${id})`;
}

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
	const correctedBy = correctionsOf(rows.map(({ inspection }) => inspection));
	return rows.map(({ inspection, inspector, inspectorEmail }) => ({
		...inspection,
		inspector: inspector ?? inspectorEmail,
		supersededById: correctedBy.get(inspection.id)?.id ?? null
	}));
}

// Writing -------------------------------------------------------------------------------

type Tx = Parameters<Parameters<typeof db.transaction>[0]>[0];

/** The joint's records in the order they were signed, with who signed them, for the rules. */
function recordsOf(tx: Tx, jointId: number) {
	return tx
		.select({
			id: i.id,
			jointId: i.jointId,
			stage: i.stage,
			method: i.method,
			repairCycle: i.repairCycle,
			decision: i.decision,
			supersedesId: i.supersedesId,
			inspectedAt: i.inspectedAt,
			inspector: schema.users.name
		})
		.from(i)
		.innerJoin(schema.users, eq(schema.users.id, i.inspectorId))
		.where(eq(i.jointId, jointId))
		.orderBy(asc(i.inspectedAt), asc(i.id))
		.all();
}

function jointInput(joint: Joint): JointInput {
	return jointInputOf(joint);
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
	// A fit-up is also judged against the joint design of the WPS the joint names.
	const wpsRow =
		input.stage === 'fitup' && joint.wpsId ? wpsRegister.row(joint.wpsId, tx) : undefined;
	const result = judgeReadings(
		set,
		jointInput(joint),
		input.stage,
		input.readings,
		projects.unitsOf(joint.projectId, tx),
		wpsRow ? jointDesign(wpsRow) : undefined
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
 * the joint's state and version. Expected failures are DomainErrors: 400 for input that cannot
 * be read or a missing reason, 404 for no joint, 409 for a step out of order.
 */
export function record(jointId: number, input: RecordInspection, inspectorId: string) {
	return events.afterCommit((tx, tell) => {
		const joint = lockedJoint(tx, jointId, input.version);
		if (joint.voidedAt) {
			throw new DomainError(
				`Joint ${joint.number} is void (${joint.voidReason ?? 'voided'}); nothing more is recorded on it.`,
				409
			);
		}
		const records = recordsOf(tx, jointId);
		const state = { ...stateInput(jointId, tx)!, inspections: records };
		const derived = deriveJointState(state);
		const correcting =
			input.supersedes !== undefined
				? records.find((r) => r.id === input.supersedes && r.jointId === jointId)
				: undefined;
		if (input.supersedes !== undefined) {
			const old = correcting ?? tx.select().from(i).where(eq(i.id, input.supersedes)).get();
			refuse(
				correctionRequestRefusal(input.supersedes, old, input, joint, {
					voided: false,
					welded: state.welds.length > 0,
					repairCycle: derived.repairCycle,
					records
				})
			);
		}
		refuse(
			stageOrderRefusal({
				number: joint.number,
				stage: input.stage,
				method: input.method,
				state,
				derived,
				correctingId: correcting?.id
			})
		);

		const reason = input.reason?.trim() || null;
		if (correcting && !isReasonGiven(reason)) {
			throw new DomainError(
				`Say why record ${correcting.id} is corrected (e.g. "re-gauged: undercut was misread"); the reason stays with the record.`,
				400,
				'reason'
			);
		}
		const verdict = judged(tx, joint, input);
		const againstVerdict = isAgainstVerdict(input.decision, verdict.verdict);
		if (againstVerdict && !isReasonGiven(reason)) {
			const standard = verdict.set ? criteriaWords(verdict.set) : 'the code';
			throw new DomainError(
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
			units: projects.unitsOf(joint.projectId, tx),
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
		tell(joint.projectId, {
			type: 'joint',
			action: 'recorded',
			jointId,
			drawingId: joint.drawingId,
			by: inspectorId
		});
		return { inspection, joint: jointSummary(row(jointId, tx)!), nde };
	});
}
