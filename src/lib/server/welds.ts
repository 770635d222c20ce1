/**
 * Welds: the foreman (or the inspector) records that a joint was welded, by whom on each pass,
 * with which procedure. Every stamp is checked against the project's welder register: active,
 * qualified for the process of that pass, the qualification not expired and its continuity
 * not lapsed. A weld on a joint in repair is the next repair cycle (R1, R2 …).
 *
 * The process of each pass comes from the request (`GTAW`, or `GTAW/SMAW` for the root, then
 * fill and cap), else from the WPS text when it names one (`WPS-CS-01 GTAW/SMAW`), else the
 * weld is refused with 400 asking for it.
 */
import { and, asc, desc, eq, inArray } from 'drizzle-orm';
import { db, schema } from './db';
import * as audit from './audit';
import * as events from './events';
import { DomainError } from './errors';
import { lockedJoint, refreshState, row, stateInput } from './joints';
import * as nde from './nde';
import { jointSummary } from './inspections';
import { deriveJointState, displayWeldNumber, type JointState } from '$lib/joint-state';
import { can, type Principal } from '$lib/permissions';
import { addDays, checkQualification, type QualificationCheck } from '$lib/welder-qualification';

/** The continuity rules, for the callers that knew them here. */
export { checkQualification, continuityValidThrough } from '$lib/welder-qualification';
import { stampKey } from '$lib/domain';
import { isKnownProcess, normalProcess } from '$lib/processes';
import { unlistedProcesses } from '$lib/wps-register';
import * as wpsRegister from './wps';
import type { RecordWeld } from '$lib/schemas/inspection';
import { WELD_PASSES, type Joint, type WeldPass } from './db/schema';

// Processes -------------------------------------------------------------------------------

export type PassProcesses = Record<WeldPass, string>;

/**
 * `GTAW` → every pass GTAW; `GTAW/SMAW` → root GTAW, fill and cap SMAW (the usual pipe
 * combination); `GTAW/SMAW/SMAW` → root, fill, cap. Null when the text cannot be read so.
 */
export function passProcesses(text: string): PassProcesses | null {
	const parts = text
		.split(/[/+]/)
		.map((part) => part.trim())
		.filter(Boolean)
		.map(normalProcess);
	if (parts.length === 0 || parts.length > 3 || parts.some((part) => part === null)) return null;
	const [root, fill = root, cap = fill] = parts as string[];
	return { root, fill, cap };
}

/** The processes a WPS designation names, such as `WPS-CS-01 GTAW/SMAW` or `WPS-VFT-02 141/111`. */
export function processFromWps(wps: string): PassProcesses | null {
	const tokens = wps.split(/[\s,;()]+/).filter(Boolean);
	for (let k = tokens.length - 1; k >= 0; k--) {
		const parts = tokens[k].split(/[/+]/).filter(Boolean);
		if (parts.length > 0 && parts.every(isKnownProcess)) return passProcesses(tokens[k]);
	}
	return null;
}

/** How the weld record writes the processes: `GTAW`, or `GTAW/SMAW` by pass. */
function processText(processes: PassProcesses, passes: readonly WeldPass[]): string {
	const used = passes.map((pass) => processes[pass]);
	const distinct = used.filter((process, k) => used.indexOf(process) === k);
	return distinct.join('/');
}

// Reading -----------------------------------------------------------------------------------

const w = schema.welds;
const ww = schema.weldWelders;

function stampsOf(weldIds: number[]) {
	if (weldIds.length === 0) return [];
	return db
		.select({
			weldId: ww.weldId,
			pass: ww.pass,
			welderId: schema.welders.id,
			stamp: schema.welders.stamp,
			name: schema.welders.name
		})
		.from(ww)
		.innerJoin(schema.welders, eq(schema.welders.id, ww.welderId))
		.where(inArray(ww.weldId, weldIds))
		.all()
		.sort((a, b) => WELD_PASSES.indexOf(a.pass) - WELD_PASSES.indexOf(b.pass));
}

/** The joint's welds in the order they were made (original, R1, R2 …), with stamps by pass. */
export function list(jointId: number) {
	const joint = db
		.select({ number: schema.joints.number })
		.from(schema.joints)
		.where(eq(schema.joints.id, jointId))
		.get();
	const welds = db
		.select({ weld: w, recordedByName: schema.users.name })
		.from(w)
		.leftJoin(schema.users, eq(schema.users.id, w.recordedBy))
		.where(eq(w.jointId, jointId))
		.orderBy(asc(w.repairCycle))
		.all();
	const stamps = stampsOf(welds.map(({ weld }) => weld.id));
	return welds.map(({ weld, recordedByName }) => ({
		...weld,
		label: displayWeldNumber(joint?.number ?? '', weld.repairCycle),
		recordedByName,
		welders: stamps
			.filter((s) => s.weldId === weld.id)
			.map(({ pass, welderId, stamp, name }) => ({ pass, welderId, stamp, name }))
	}));
}

// Writing -----------------------------------------------------------------------------------

type Tx = Parameters<Parameters<typeof db.transaction>[0]>[0];

/** Why a joint in this state takes no weld, and what comes first. */
const NOT_READY: Record<Exclude<JointState, 'ready_to_weld' | 'repair'>, string> = {
	awaiting_fitup: 'has no accepted fit-up yet: the inspector checks the fit-up before welding.',
	fitup_rejected:
		'had its fit-up rejected: correct the fit-up and have it inspected again before welding.',
	awaiting_visual:
		'is already welded and waits for its visual inspection; a repair weld follows a reject only.',
	awaiting_nde:
		'is already welded and waits for NDE; a repair weld follows a rejected result only.',
	awaiting_lot:
		"is already welded and waits on its NDE lot's sample; a repair weld follows a rejected result only.",
	accepted_by_lot:
		"is accepted by its NDE lot's sample: nothing more is welded on it. A cut-out becomes a new joint.",
	accepted: 'is accepted: nothing more is welded on it. A cut-out becomes a new joint.',
	void: 'is void: nothing more is recorded on it.'
};

/** The repair cycle this weld makes: 0 once the fit-up is accepted, the next one in repair. */
function cycleOf(tx: Tx, joint: Joint): { cycle: number; previousOn: string | null } {
	const derived = deriveJointState(stateInput(joint.id, tx)!);
	if (derived.state === 'ready_to_weld') return { cycle: 0, previousOn: null };
	if (derived.state === 'repair') {
		const previous = tx
			.select({ weldedOn: w.weldedOn })
			.from(w)
			.where(eq(w.jointId, joint.id))
			.orderBy(desc(w.repairCycle))
			.get();
		return { cycle: derived.repairCycle + 1, previousOn: previous?.weldedOn ?? null };
	}
	throw new DomainError(
		`Joint ${displayWeldNumber(joint.number, derived.repairCycle)} ${NOT_READY[derived.state]}`,
		409
	);
}

function todayUtc(): string {
	return new Date().toISOString().slice(0, 10);
}

interface StampedWelder {
	id: number;
	stamp: string;
	name: string;
	status: 'active' | 'inactive';
}

interface Problem {
	pass: WeldPass;
	welder: StampedWelder;
	process: string;
	check: QualificationCheck;
}

/** Clause references written beside the continuity message, as the inspector will quote them. */
const CONTINUITY_SOURCE = 'ASME IX QW-322.1; AWS D1.1:2020 6.2.3.1';

function problemText({ welder, process, check }: Problem): string {
	const who = `Welder ${welder.stamp} (${welder.name})`;
	if (check.ok) return `${who} is qualified for ${process}.`;
	switch (check.problem) {
		case 'not_qualified':
			return `${who} has no ${process} qualification on record; add the welder's ${process} qualification first.`;
		case 'not_yet':
			return `${who} is qualified for ${process} from ${check.qualifiedOn} only, after this weld's date.`;
		case 'expired':
			return `${who}: the ${process} qualification expired after ${check.expiresOn}.`;
		case 'lapsed':
			return `${who}: the ${process} qualification lapsed on ${check.lapsedOn}, six months after its last use on ${check.lastUsedOn} (${CONTINUITY_SOURCE}).`;
	}
}

function findWelders(tx: Tx, projectId: number, stamps: string[]): Map<string, StampedWelder> {
	const rows = tx
		.select({
			id: schema.welders.id,
			stamp: schema.welders.stamp,
			name: schema.welders.name,
			status: schema.welders.status
		})
		.from(schema.welders)
		.where(
			and(
				eq(schema.welders.projectId, projectId),
				inArray(schema.welders.stampKey, stamps.map(stampKey))
			)
		)
		.all();
	return new Map(rows.map((r) => [stampKey(r.stamp), r]));
}

function qualificationsOf(tx: Tx, welderIds: number[]) {
	return tx
		.select()
		.from(schema.welderQualifications)
		.where(inArray(schema.welderQualifications.welderId, welderIds))
		.all();
}

/**
 * Record a weld on a joint, with the welder of each pass, in one transaction with the
 * welders' continuity, the joint's state and its version. Expected failures are DomainErrors
 * (400 bad input, 404, 409 out of order or a welder refused) or 403 for an override the caller may not make.
 */
export function record(
	jointId: number,
	input: RecordWeld,
	user: Principal & { id: string },
	options: { today?: string } = {}
) {
	return events.afterCommit((tx, tell) => {
		const joint = lockedJoint(tx, jointId, input.version);
		if (joint.voidedAt) {
			throw new DomainError(
				`Joint ${joint.number} is void (${joint.voidReason ?? 'voided'}); nothing more is recorded on it.`,
				409
			);
		}
		const { cycle, previousOn } = cycleOf(tx, joint);
		const label = displayWeldNumber(joint.number, cycle);

		// A day's grace: a site ahead of UTC records today's date before UTC reaches it.
		const latest = addDays(options.today ?? todayUtc(), 1);
		if (input.weldedOn > latest) {
			throw new DomainError(
				`The weld date ${input.weldedOn} is in the future; give the day it was welded.`,
				400,
				'weldedOn'
			);
		}
		if (previousOn && input.weldedOn < previousOn) {
			throw new DomainError(
				`Repair ${label} cannot be welded before the weld it repairs (${previousOn}).`,
				400,
				'weldedOn'
			);
		}

		// The joint's WPS from the register names the processes; typed text may name them too.
		const wpsRow = joint.wpsId ? wpsRegister.row(joint.wpsId, tx) : undefined;
		const wps = input.wps || (wpsRow ? `${wpsRow.number} rev ${wpsRow.revision}` : joint.wps);
		const processes = input.process
			? passProcesses(input.process)
			: wpsRow && !input.wps
				? passProcesses(wpsRow.processes.join('/'))
				: processFromWps(wps);
		if (!processes) {
			throw new DomainError(
				input.process
					? `Cannot read the process "${input.process}": give its letters (GTAW, SMAW, FCAW …) or ISO 4063 number, one for all passes or by pass such as GTAW/SMAW (root, then fill and cap).`
					: `The WPS ${wps ? `"${wps}" names` : 'is blank and names'} no welding process: give the process, such as "GTAW" or "GTAW/SMAW" (root, then fill and cap).`,
				400,
				'process'
			);
		}

		const passes = WELD_PASSES.filter((pass) => input.welders[pass]);
		const stamps = passes.map((pass) => input.welders[pass]!);
		const found = findWelders(tx, joint.projectId, stamps);
		const assigned = passes.map((pass) => {
			const welder = found.get(stampKey(input.welders[pass]!));
			if (!welder) {
				throw new DomainError(
					`No welder with stamp ${input.welders[pass]} is registered on this project; check the stamp, or have the welder added to the register first.`,
					400,
					`welders.${pass}`
				);
			}
			if (welder.status !== 'active') {
				throw new DomainError(
					`Welder ${welder.stamp} (${welder.name}) is inactive on this project and cannot be stamped on a weld.`,
					409,
					`welders.${pass}`
				);
			}
			return { pass, welder, process: processes[pass] };
		});

		// One check per welder and process: a welder on fill and cap with SMAW is checked once.
		const qualifications = qualificationsOf(
			tx,
			assigned.map((a) => a.welder.id)
		);
		const uses: (Problem & { qualification?: (typeof qualifications)[number] })[] = [];
		for (const { pass, welder, process } of assigned) {
			if (uses.some((u) => u.welder.id === welder.id && u.process === process)) continue;
			const qualification = qualifications.find(
				(q) => q.welderId === welder.id && q.process.toUpperCase() === process
			);
			uses.push({
				pass,
				welder,
				process,
				qualification,
				check: checkQualification(qualification, input.weldedOn)
			});
		}
		const problems = uses.filter((u) => !u.check.ok);
		const hard = problems.find((p) => !p.check.ok && !p.check.overridable);
		if (hard) throw new DomainError(problemText(hard), 409, `welders.${hard.pass}`);
		// A process the joint's WPS does not list is refused as a lapsed qualification is.
		const unlisted = wpsRow
			? unlistedProcesses(
					wpsRow,
					passes.map((pass) => processes[pass])
				)
			: [];
		const wpsProblem = unlisted.length
			? `WPS ${wpsRow!.number} rev ${wpsRow!.revision} does not list ${unlisted.join(' or ')} (it lists ${wpsRow!.processes.join(', ')}).`
			: null;
		const mayOverride = can(user, 'weld.override', joint.projectId);
		if (problems.length > 0 || wpsProblem) {
			const told = [...(wpsProblem ? [wpsProblem] : []), ...problems.map(problemText)].join(' ');
			if (!input.override) {
				throw new DomainError(
					`${told} ${wpsProblem && problems.length === 0 ? 'Weld to a WPS that lists the process' : 'Renew the qualification'}, or ${mayOverride ? 'record the weld with an override reason' : 'ask an administrator to record the weld with an override reason'}.`,
					409,
					problems.length > 0 ? `welders.${problems[0].pass}` : 'process'
				);
			}
			if (!mayOverride) {
				throw new DomainError(
					`Only an administrator may override a welder qualification check. ${told}`,
					403,
					'override'
				);
			}
		}
		const overrideReason = problems.length > 0 || wpsProblem ? input.override!.reason : null;

		const now = Date.now();
		const weld = tx
			.insert(w)
			.values({
				jointId,
				repairCycle: cycle,
				weldedOn: input.weldedOn,
				wps,
				process: processText(processes, passes),
				overrideReason,
				recordedBy: user.id,
				recordedAt: now
			})
			.returning()
			.get();
		for (const { pass, welder } of assigned) {
			tx.insert(ww).values({ weldId: weld.id, welderId: welder.id, pass }).run();
		}

		// A weld made on an overridden qualification does not renew it (QW-322.2 asks for a
		// test), so only qualifications that passed the check move their last use forward.
		for (const { welder, qualification, check } of uses) {
			if (!check.ok || !qualification) continue;
			if (qualification.lastUsedOn && qualification.lastUsedOn >= input.weldedOn) continue;
			tx.update(schema.welderQualifications)
				.set({ lastUsedOn: input.weldedOn })
				.where(eq(schema.welderQualifications.id, qualification.id))
				.run();
			audit.record(
				{
					action: 'continuity',
					entity: 'welder',
					entityId: welder.id,
					projectId: joint.projectId,
					userId: user.id,
					at: now,
					before: { process: qualification.process, lastUsedOn: qualification.lastUsedOn },
					after: { process: qualification.process, lastUsedOn: input.weldedOn, weldId: weld.id }
				},
				tx
			);
		}

		tx.update(schema.joints)
			.set({ version: joint.version + 1, updatedAt: now })
			.where(eq(schema.joints.id, jointId))
			.run();
		const after = refreshState(jointId, tx, now)!;
		// NDE lots: an original weld joins the open lot of its grouping.
		nde.afterWeld(tx, jointId, cycle, now);
		audit.record(
			{
				action: 'weld',
				entity: 'joint',
				entityId: jointId,
				projectId: joint.projectId,
				userId: user.id,
				at: now,
				before: { state: joint.state, repairCycle: joint.repairCycle },
				after: {
					weldId: weld.id,
					repairCycle: cycle,
					weldedOn: weld.weldedOn,
					wps,
					process: weld.process,
					welders: Object.fromEntries(assigned.map((a) => [a.pass, a.welder.stamp])),
					...(overrideReason
						? {
								override: {
									reason: overrideReason,
									refused: [...(wpsProblem ? [wpsProblem] : []), ...problems.map(problemText)]
								}
							}
						: {}),
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
			by: user.id
		});
		return {
			weld: {
				...weld,
				label,
				welders: assigned.map(({ pass, welder, process }) => ({
					pass,
					welderId: welder.id,
					stamp: welder.stamp,
					name: welder.name,
					process
				}))
			},
			joint: jointSummary(row(jointId, tx)!)
		};
	});
}
