/**
 * First-start data. With demo data on (the default), an empty database gets the invented
 * demo job: users for every role, two projects, their drawings as real PDFs, welders, and
 * about 150 joints spread over every state with plausible records. Seeded random, so every
 * run gives the same rows (tests rely on it). With `TACKSHEET_DEMO=0` it creates only the
 * administrator named by ADMIN_EMAIL / ADMIN_PASSWORD.
 */
import { and, count, eq, sql } from 'drizzle-orm';
import { db as defaultDb, schema, type Db } from '../db';
import { config } from '../config';
import { hashPassword } from '../passwords';
import * as storage from '../storage';
import * as audit from '../audit';
import * as users from '../users';
import { refreshState } from '../joints';
import * as wpsRegister from '../wps';
import { emptyWps } from '$lib/wps-register';
import { renderDemoSheet, type DemoWeld } from './sheets';
import {
	DEMO_PASSWORD,
	DEMO_PROJECTS,
	DEMO_USERS,
	demoSheetSpec,
	type DemoDrawing,
	type DemoProject
} from './scenario';
import { fitupReadings, visualReadings, type DemoOutcome } from './readings';
import { judgeReadings } from '../inspections';
import { passProcesses } from '../welds';
import { weldNumberSortKey } from '$lib/weld-numbers';
import { mulberry32 } from '$lib/random';
import { seedDemoLots } from '../nde/demo';
import { outsideDiameterMm } from '$lib/pipe-sizes';
import { parseLength } from '$lib/units';
import type { JointState } from '$lib/joint-state';
import type { UnitSystem } from '../db/schema';
import { stampKey } from '$lib/domain';

const DAY = 86_400_000;
/** The demo job's calendar is fixed, so the records are the same whatever today is. */
const JOB_START = Date.UTC(2026, 9, 1, 7, 0);

/** Share of joints per target state; the rest follow from the drawing revision (void). */
const STATE_MIX: [Exclude<JointState, 'void'>, number][] = [
	['awaiting_fitup', 0.17],
	['fitup_rejected', 0.05],
	['ready_to_weld', 0.12],
	['awaiting_visual', 0.15],
	['repair', 0.08],
	['awaiting_nde', 0.1],
	['accepted', 0.33]
];

export interface SeedResult {
	seeded: boolean;
	users: number;
	projects: number;
	drawings: number;
	joints: number;
}

export async function seedIfEmpty(db: Db = defaultDb): Promise<SeedResult> {
	const existing = db.select({ n: count() }).from(schema.users).get()?.n ?? 0;
	if (existing > 0) return { seeded: false, users: existing, projects: 0, drawings: 0, joints: 0 };
	if (!config.demo) {
		const created = await users.setUpFirstAdmin(db);
		return { seeded: created, users: created ? 1 : 0, projects: 0, drawings: 0, joints: 0 };
	}
	return seedDemo(db);
}

async function seedDemo(db: Db): Promise<SeedResult> {
	const hashes = await Promise.all(DEMO_USERS.map(() => hashPassword(DEMO_PASSWORD)));
	// Sheets are drawn before the transaction: it stays synchronous, as better-sqlite3 wants.
	const sheets = new Map<string, Awaited<ReturnType<typeof renderDemoSheet>>[]>();
	for (const project of DEMO_PROJECTS) {
		for (const drawing of project.drawings) {
			sheets.set(
				drawing.number,
				await Promise.all(
					drawing.revisions.map((revision) =>
						renderDemoSheet(demoSheetSpec(project, drawing, revision))
					)
				)
			);
		}
	}
	const files: { key: string; bytes: Uint8Array }[] = [];
	for (const list of sheets.values()) {
		for (const sheet of list)
			files.push({ key: storage.newKey('revisions', '.pdf'), bytes: sheet.bytes });
	}
	await Promise.all(files.map((f) => storage.put(f.key, f.bytes)));

	try {
		return db.transaction((tx) => {
			const userIds = DEMO_USERS.map(
				(user, i) =>
					tx
						.insert(schema.users)
						.values({
							email: user.email,
							name: user.name,
							// eslint-disable-next-line no-restricted-syntax -- the seed writes the scenario's accounts as given
							isAdmin: user.isAdmin ?? false,
							passwordHash: hashes[i],
							emailVerified: new Date(JOB_START),
							createdAt: JOB_START - 30 * DAY
						})
						.returning({ id: schema.users.id })
						.get().id
			);
			const byEmail = new Map(DEMO_USERS.map((u, i) => [u.email, userIds[i]]));
			const people = {
				admin: byEmail.get('admin@tacksheet.test')!,
				doccon: byEmail.get('doccon@tacksheet.test')!,
				inspectors: [
					byEmail.get('inspector@tacksheet.test')!,
					byEmail.get('inspector2@tacksheet.test')!
				],
				foreman: byEmail.get('foreman@tacksheet.test')!
			};
			let fileIndex = 0;
			let drawingCount = 0;
			let jointCount = 0;
			DEMO_PROJECTS.forEach((project, projectIndex) => {
				const random = mulberry32(20260 + projectIndex);
				const projectId = tx
					.insert(schema.projects)
					.values({
						code: project.code,
						name: project.name,
						client: project.client,
						contractor: project.contractor,
						site: project.site,
						units: project.units,
						defaultCriteriaSet: project.defaultCriteriaSet,
						createdAt: JOB_START - 20 * DAY
					})
					.returning({ id: schema.projects.id })
					.get().id;
				DEMO_USERS.forEach((user, i) => {
					if (user.role && (!user.projects || user.projects.includes(project.code))) {
						tx.insert(schema.memberships)
							.values({ projectId, userId: userIds[i], role: user.role })
							.run();
					}
				});
				const welderIds = seedWelders(tx, projectId, project);
				for (const typed of project.wpsRegister) {
					const record = wpsRegister.readOrThrow({ ...emptyWps(), ...typed }, projectId, tx);
					wpsRegister.insertInTransaction(tx, projectId, record, people.admin);
				}
				for (const drawing of project.drawings) {
					const revisionSheets = sheets.get(drawing.number)!;
					const keys = revisionSheets.map(() => files[fileIndex++].key);
					jointCount += seedDrawing(tx, {
						projectId,
						project,
						drawing,
						revisionSheets,
						keys,
						random,
						people,
						welderIds
					});
					drawingCount++;
				}
				recordLastUse(tx, projectId);
				// Joints typed with a WPS number name that WPS of the register.
				wpsRegister.linkTypedJoints(tx, projectId);
			});
			// NDE lots in every stage, from the welds above.
			seedDemoLots(tx);
			audit.record({ action: 'seed', entity: 'database', after: { demo: true } }, tx);
			return {
				seeded: true,
				users: userIds.length,
				projects: DEMO_PROJECTS.length,
				drawings: drawingCount,
				joints: jointCount
			};
		});
	} catch (error) {
		await Promise.all(files.map((f) => storage.remove(f.key)));
		throw error;
	}
}

type Tx = Parameters<Parameters<Db['transaction']>[0]>[0];

function seedWelders(tx: Tx, projectId: number, project: DemoProject): Map<string, number[]> {
	const byProcess = new Map<string, number[]>();
	for (const welder of project.welders) {
		const id = tx
			.insert(schema.welders)
			.values({
				projectId,
				stamp: welder.stamp,
				stampKey: stampKey(welder.stamp),
				name: welder.name,
				employer: welder.employer
			})
			.returning({ id: schema.welders.id })
			.get().id;
		for (const q of welder.processes) {
			tx.insert(schema.welderQualifications)
				.values({ welderId: id, ...q })
				.run();
			// Only a process the welder kept using during the job is given them in the seeded
			// welds; one the scenario lets lapse (last used before the job) stays unused.
			if (Date.parse(`${q.lastUsedOn}T00:00:00Z`) < JOB_START) continue;
			byProcess.set(q.process, [...(byProcess.get(q.process) ?? []), id]);
		}
	}
	return byProcess;
}

/**
 * Continuity follows the records: each welder's last use of a process is the date of their
 * latest seeded weld in it, read per pass as the weld record names the processes (root, then
 * fill and cap), as recording a weld through the app would have left it.
 */
function recordLastUse(tx: Tx, projectId: number) {
	const passes = tx
		.select({
			welderId: schema.weldWelders.welderId,
			pass: schema.weldWelders.pass,
			process: schema.welds.process,
			weldedOn: schema.welds.weldedOn
		})
		.from(schema.weldWelders)
		.innerJoin(schema.welds, eq(schema.welds.id, schema.weldWelders.weldId))
		.innerJoin(schema.joints, eq(schema.joints.id, schema.welds.jointId))
		.where(eq(schema.joints.projectId, projectId))
		.all();
	const latest = new Map<string, { welderId: number; process: string; on: string }>();
	for (const row of passes) {
		const process = passProcesses(row.process)?.[row.pass];
		if (!process) continue;
		const key = `${row.welderId} ${process}`;
		const seen = latest.get(key);
		if (!seen || row.weldedOn > seen.on) latest.set(key, { ...row, process, on: row.weldedOn });
	}
	for (const { welderId, process, on } of latest.values()) {
		tx.update(schema.welderQualifications)
			.set({ lastUsedOn: on })
			.where(
				and(
					eq(schema.welderQualifications.welderId, welderId),
					sql`upper(${schema.welderQualifications.process}) = ${process.toUpperCase()}`
				)
			)
			.run();
	}
}

interface DrawingSeed {
	projectId: number;
	project: DemoProject;
	drawing: DemoDrawing;
	revisionSheets: Awaited<ReturnType<typeof renderDemoSheet>>[];
	keys: string[];
	random: () => number;
	people: { admin: string; doccon: string; inspectors: string[]; foreman: string };
	welderIds: Map<string, number[]>;
}

function seedDrawing(tx: Tx, s: DrawingSeed): number {
	const { projectId, project, drawing, random } = s;
	const pick = <T>(items: readonly T[]): T => items[Math.floor(random() * items.length)];
	const drawingId = tx
		.insert(schema.drawings)
		.values({
			projectId,
			number: drawing.number,
			title: drawing.title,
			kind: drawing.kind,
			line: drawing.line,
			area: drawing.area,
			system: drawing.system,
			createdAt: JOB_START - 14 * DAY
		})
		.returning({ id: schema.drawings.id })
		.get().id;

	const last = drawing.revisions.length - 1;
	const revisionIds = drawing.revisions.map((revision, i) => {
		const sheet = s.revisionSheets[i];
		const uploadedAt = Date.parse(`${revision.revisionDate}T09:30:00Z`);
		const id = tx
			.insert(schema.revisions)
			.values({
				drawingId,
				label: revision.revision,
				status: i === last ? 'current' : 'superseded',
				note: revision.revisionHistory?.at(-1)?.description ?? '',
				issuedOn: revision.revisionDate,
				fileKey: s.keys[i],
				fileName: `${drawing.number}_rev${revision.revision}.pdf`,
				sha256: storage.sha256(sheet.bytes),
				bytes: sheet.bytes.byteLength,
				pageCount: sheet.pages.length,
				uploadedBy: s.people.doccon,
				uploadedAt,
				supersededAt:
					i === last ? null : Date.parse(`${drawing.revisions[i + 1].revisionDate}T09:30:00Z`)
			})
			.returning({ id: schema.revisions.id })
			.get().id;
		sheet.pages.forEach((page, pageIndex) => {
			tx.insert(schema.pages)
				.values({
					revisionId: id,
					pageIndex,
					x0: 0,
					y0: 0,
					x1: page.width,
					y1: page.height,
					rotation: page.rotation
				})
				.run();
		});
		return id;
	});

	// Joints are the union of weld numbers over the revisions; a number that a later
	// revision drops is voided by that revision, never deleted.
	const numbers = new Map<string, { weld: DemoWeld; revisions: Map<number, DemoWeld> }>();
	s.revisionSheets.forEach((sheet, i) => {
		for (const weld of sheet.welds) {
			const entry = numbers.get(weld.number) ?? { weld, revisions: new Map() };
			entry.revisions.set(i, weld);
			numbers.set(weld.number, entry);
		}
	});

	const historyBase = {
		projectId,
		drawing,
		units: project.units,
		random,
		pick,
		people: s.people,
		welderIds: s.welderIds
	};
	let created = 0;
	let flaggedOnDrawing = false;
	for (const [number, entry] of numbers) {
		const { weld } = entry;
		const onCurrent = entry.revisions.has(last);
		const firstRevision = Math.min(...entry.revisions.keys());
		const createdAt = JOB_START + Math.floor(random() * 10) * DAY;
		const requiredSize = weld.kind === 'fillet' ? weld.sizeText : '';
		const jointValues = {
			projectId,
			drawingId,
			number,
			sortKey: weldNumberSortKey(number),
			kind: weld.kind,
			location: weld.location,
			line: drawing.line,
			spool: drawing.kind === 'shop' ? (drawing.number.split('-SP-')[1] ?? '') : '',
			sizeText: weld.sizeText,
			diameterMm: drawing.kind === 'structural' ? null : outsideDiameterMm(weld.sizeText),
			thicknessText: weld.thicknessText,
			thicknessMm: lengthMm(weld.thicknessText, project.units),
			requiredSizeText: requiredSize,
			requiredSizeMm: requiredSize ? lengthMm(requiredSize, project.units) : null,
			material: drawing.material,
			wps: drawing.wps,
			criteriaSetId: drawing.criteriaSetId,
			ndeRequired: drawing.ndeRequired,
			createdBy: s.people.doccon,
			createdAt,
			updatedAt: createdAt,
			stateSince: createdAt
		};
		const jointId = tx
			.insert(schema.joints)
			.values(jointValues)
			.returning({ id: schema.joints.id })
			.get().id;
		entry.revisions.forEach((w, i) => {
			// Carried to the new revision; a few still wait for the document controller, and on
			// every revised drawing at least one does.
			const carried = i > firstRevision && i === last;
			const needsReview = carried && (random() < 0.3 || !flaggedOnDrawing);
			if (needsReview) flaggedOnDrawing = true;
			tx.insert(schema.pins)
				.values({
					jointId,
					revisionId: revisionIds[i],
					pageIndex: w.pageIndex,
					x: w.x,
					y: w.y,
					needsReview,
					createdBy: i > firstRevision ? s.people.doccon : s.people.inspectors[0],
					createdAt: Date.parse(`${drawing.revisions[i].revisionDate}T10:00:00Z`)
				})
				.run();
		});

		// A few butt welds that kept failing were cut out: the joint is voided and a new joint
		// with an N suffix takes its place on the map.
		const cutOut = onCurrent && weld.kind === 'butt' && random() < 0.05;
		const history = recordHistory(tx, {
			...historyBase,
			jointId,
			weld,
			requiredSize,
			target: cutOut ? 'repair' : pickState(random),
			start: createdAt
		});
		let voidReason: string | null = null;
		let voidedAt = 0;
		if (!onCurrent) {
			voidReason = `Deleted by revision ${drawing.revisions[last].revision}`;
			voidedAt = Math.max(
				Date.parse(`${drawing.revisions[last].revisionDate}T11:00:00Z`),
				history.end + DAY
			);
		} else if (cutOut) {
			voidReason = `Cut out after a failed repair; replaced by ${number}N`;
			voidedAt = history.end + DAY;
		}
		if (voidReason) {
			tx.update(schema.joints)
				.set({
					voidReason,
					voidedAt,
					voidedBy: onCurrent ? s.people.inspectors[0] : s.people.doccon
				})
				.where(eq(schema.joints.id, jointId))
				.run();
		}
		refreshState(jointId, tx, Math.max(history.end, createdAt, voidedAt));
		created++;

		if (cutOut) {
			const replacement = `${number}N`;
			const at = voidedAt + DAY;
			const newId = tx
				.insert(schema.joints)
				.values({
					...jointValues,
					number: replacement,
					sortKey: weldNumberSortKey(replacement),
					replacesJointId: jointId,
					createdAt: at,
					updatedAt: at,
					stateSince: at
				})
				.returning({ id: schema.joints.id })
				.get().id;
			const current = entry.revisions.get(last)!;
			tx.insert(schema.pins)
				.values({
					jointId: newId,
					revisionId: revisionIds[last],
					pageIndex: current.pageIndex,
					x: current.x,
					y: current.y,
					createdBy: s.people.inspectors[0],
					createdAt: at
				})
				.run();
			const again = recordHistory(tx, {
				...historyBase,
				jointId: newId,
				weld,
				requiredSize,
				target: pick(['awaiting_fitup', 'ready_to_weld', 'awaiting_visual'] as const),
				start: at
			});
			refreshState(newId, tx, Math.max(again.end, at));
			created++;
		}
	}
	return created;
}

function pickState(random: () => number): Exclude<JointState, 'void'> {
	let r = random();
	for (const [state, share] of STATE_MIX) {
		if (r < share) return state;
		r -= share;
	}
	return 'accepted';
}

interface HistorySeed {
	jointId: number;
	projectId: number;
	target: JointState;
	start: number;
	drawing: DemoDrawing;
	units: UnitSystem;
	weld: DemoWeld;
	requiredSize: string;
	random: () => number;
	pick: <T>(items: readonly T[]) => T;
	people: DrawingSeed['people'];
	welderIds: Map<string, number[]>;
}

/** Write the welds and inspections that bring a joint to its target state. */
function recordHistory(tx: Tx, h: HistorySeed): { end: number } {
	const { target, pick, random } = h;
	let at = h.start + DAY + Math.floor(random() * 6 * 3_600_000);
	const step = () => (at += Math.floor((0.5 + random() * 3) * DAY));
	const inspector = pick(h.people.inspectors);
	const criteria = h.drawing.criteriaSetId;
	const judgeJoint = {
		kind: h.weld.kind,
		thickness: h.weld.thicknessText,
		requiredSize: h.requiredSize || undefined,
		loading: 'static' as const,
		member: 'primary' as const
	};
	const inspect = (
		stage: 'fitup' | 'visual' | 'nde',
		decision: 'accept' | 'reject',
		repairCycle: number,
		outcome: DemoOutcome
	) => {
		let values: Partial<typeof schema.inspections.$inferInsert>;
		if (stage === 'nde') {
			values = {
				method: 'RT',
				reportNo: `RT-${h.drawing.number.split('-')[0]}-${String(h.jointId).padStart(4, '0')}${repairCycle ? `-R${repairCycle}` : ''}`,
				technician: pick(['K. Averill (Level II)', 'S. Marchetti (Level II)']),
				findings: [],
				readings: [],
				verdict: null
			};
		} else {
			const texts =
				stage === 'fitup'
					? fitupReadings(h.weld.kind, h.units, outcome, h.weld.thicknessText, pick)
					: visualReadings(h.weld.kind, h.units, outcome, h.requiredSize, pick);
			const judged = judgeReadings(criteria, judgeJoint, stage, texts, h.units);
			values = {
				readings: judged.readings,
				findings: judged.findings,
				verdict: judged.verdict,
				criteriaSetId: criteria,
				criteriaSetVersion: judged.version,
				againstVerdict:
					judged.verdict !== 'judge' && (judged.verdict === 'within') !== (decision === 'accept')
			};
			if (values.againstVerdict)
				values.reason = 'Checked again with a second gauge; reading confirmed acceptable.';
		}
		tx.insert(schema.inspections)
			.values({
				jointId: h.jointId,
				stage,
				repairCycle,
				decision,
				inspectorId: inspector,
				inspectedAt: at,
				...values
			})
			.run();
	};
	const weld = (repairCycle: number) => {
		const gtaw = h.welderIds.get('GTAW') ?? h.welderIds.get('FCAW') ?? [];
		const smaw = h.welderIds.get('SMAW') ?? gtaw;
		const structural = h.drawing.kind === 'structural';
		const process = structural ? 'FCAW' : 'GTAW/SMAW';
		const id = tx
			.insert(schema.welds)
			.values({
				jointId: h.jointId,
				repairCycle,
				weldedOn: new Date(at).toISOString().slice(0, 10),
				wps: h.drawing.wps,
				process,
				recordedBy: h.people.foreman,
				recordedAt: at
			})
			.returning({ id: schema.welds.id })
			.get().id;
		const pool = structural ? (h.welderIds.get('FCAW') ?? gtaw) : gtaw;
		const root = pick(pool);
		const fill = structural ? root : pick(smaw);
		tx.insert(schema.weldWelders).values({ weldId: id, welderId: root, pass: 'root' }).run();
		tx.insert(schema.weldWelders).values({ weldId: id, welderId: fill, pass: 'fill' }).run();
		tx.insert(schema.weldWelders).values({ weldId: id, welderId: fill, pass: 'cap' }).run();
	};
	const selectForRt = () => {
		if (h.drawing.ndeRequired.includes('RT') || h.weld.kind !== 'butt') return false;
		tx.insert(schema.ndeSelections)
			.values({
				projectId: h.projectId,
				jointId: h.jointId,
				method: 'RT',
				lot: h.drawing.line,
				reason: 'random',
				selectedBy: inspector,
				selectedAt: at
			})
			.run();
		return true;
	};

	if (target === 'awaiting_fitup') return { end: h.start };
	if (target === 'fitup_rejected') {
		inspect('fitup', 'reject', 0, 'bad');
		return { end: at };
	}
	inspect('fitup', 'accept', 0, 'good');
	if (target === 'ready_to_weld') return { end: at };
	step();
	weld(0);
	if (target === 'awaiting_visual') return { end: at };
	step();

	const ndeNeeded = h.drawing.ndeRequired.includes('RT');
	if (target === 'repair') {
		if (random() < 0.6 || h.weld.kind !== 'butt') {
			inspect('visual', 'reject', 0, 'bad');
		} else {
			inspect('visual', 'accept', 0, 'good');
			if (!ndeNeeded) selectForRt();
			step();
			inspect('nde', 'reject', 0, 'bad');
		}
		return { end: at };
	}

	// Some accepted joints went through one repair first.
	let cycle = 0;
	if (target === 'accepted' && random() < 0.15) {
		inspect('visual', 'reject', 0, 'bad');
		step();
		weld(1);
		step();
		cycle = 1;
	}
	inspect('visual', 'accept', cycle, 'good');
	const rt = ndeNeeded || ((target === 'awaiting_nde' || random() < 0.2) && selectForRt());
	if (!rt) {
		if (target === 'awaiting_nde') {
			// A joint that is not a sampled butt weld waits for MT of the fillet instead.
			tx.insert(schema.ndeSelections)
				.values({
					projectId: h.projectId,
					jointId: h.jointId,
					method: 'MT',
					lot: h.drawing.line,
					reason: 'client',
					selectedBy: inspector,
					selectedAt: at
				})
				.run();
		}
		return { end: at };
	}
	if (target === 'awaiting_nde') return { end: at };
	step();
	inspect('nde', 'accept', cycle, 'good');
	return { end: at };
}

function lengthMm(text: string, units: UnitSystem): number | null {
	const parsed = parseLength(text, { units });
	return parsed.ok ? parsed.value : null;
}
