/**
 * The demo job's NDE: its lots formed from the seeded welds, and set in every stage a QC
 * manager meets (a lot closed with its sample passed, one under progressive examination after
 * a reject, one sampled and waiting for results, and open ones), all on the demo job's fixed
 * calendar and with fixed seeds, so every seed gives the same rows. Called once at the end of
 * the seed, inside its transaction. Invented data: the contractor addresses are not real.
 */
import { eq, max } from 'drizzle-orm';
import { schema } from '../db';
import { refreshState } from '../joints';
import { readLotRule, type LotRule } from '$lib/nde/extent';
import { isSample, proposeSelection } from '$lib/nde/sampling';
import { afterResult } from './results';
import { closeIn, syncIn } from './manage';
import { commitIn } from './selection';
import { lotData, type Tx } from './rows';

const DAY = 86_400_000;

/** Per demo project: the NDE contractor's (invented) address, and the owner's own extents. */
const DEMO_RULES: Record<string, Partial<LotRule>> = {
	'LBM-20': { contractorEmail: 'rt-requests@harrowgate-ndt.test' },
	'VFT-3': {
		contractorEmail: 'rt-bookings@fjordline-inspection.test',
		// ISO 5817 sets acceptance levels only; the (invented) owner's spec asks 10 % RT.
		extents: { 'iso-5817-c': [{ method: 'RT', percent: 10, kinds: ['butt'] }] }
	}
};

const TECHNICIAN = { RT: 'K. Averill (Level II)', UT: 'S. Marchetti (Level II)' } as const;

function userId(tx: Tx, email: string): string {
	return tx
		.select({ id: schema.users.id })
		.from(schema.users)
		.where(eq(schema.users.email, email))
		.get()!.id;
}

/** An NDE result written as `inspections.record` writes one: row, state, then the lots. */
function result(
	tx: Tx,
	jointId: number,
	method: 'RT' | 'UT' | 'MT' | 'PT',
	decision: 'accept' | 'reject',
	inspectorId: string,
	at: number,
	units: 'imperial' | 'metric',
	extras: Parameters<typeof afterResult>[1]['extras'] = {}
) {
	const joint = tx.select().from(schema.joints).where(eq(schema.joints.id, jointId)).get()!;
	const drawing = tx
		.select({ number: schema.drawings.number })
		.from(schema.drawings)
		.where(eq(schema.drawings.id, joint.drawingId))
		.get()!;
	const inspection = tx
		.insert(schema.inspections)
		.values({
			jointId,
			stage: 'nde',
			method,
			repairCycle: joint.repairCycle,
			decision,
			reportNo: `${method}-${drawing.number.split('-').slice(0, 2).join('-')}-${String(jointId).padStart(4, '0')}`,
			technician: method === 'UT' ? TECHNICIAN.UT : TECHNICIAN.RT,
			inspectorId,
			inspectedAt: at
		})
		.returning()
		.get();
	tx.update(schema.joints)
		.set({ version: joint.version + 1, updatedAt: at })
		.where(eq(schema.joints.id, jointId))
		.run();
	refreshState(jointId, tx, at);
	return afterResult(tx, { inspection, joint, extras, units, userId: inspectorId });
}

export function seedDemoLots(tx: Tx) {
	const inspector = userId(tx, 'inspector@tacksheet.test');
	const admin = userId(tx, 'admin@tacksheet.test');
	for (const project of tx.select().from(schema.projects).all()) {
		const own = DEMO_RULES[project.code];
		if (own) {
			const rule = { ...readLotRule(project.ndeLotRule), ...own };
			tx.update(schema.projects)
				.set({ ndeLotRule: rule })
				.where(eq(schema.projects.id, project.id))
				.run();
		}
		// The job's clock: a day after the last weld of the project.
		const lastWeld =
			tx
				.select({ at: max(schema.welds.recordedAt) })
				.from(schema.welds)
				.innerJoin(schema.joints, eq(schema.joints.id, schema.welds.jointId))
				.where(eq(schema.joints.projectId, project.id))
				.get()?.at ?? 0;
		let at = lastWeld + DAY;
		syncIn(tx, project.id, at);

		const lots = tx
			.select({ id: schema.ndeLots.id, label: schema.ndeLots.label })
			.from(schema.ndeLots)
			.where(eq(schema.ndeLots.projectId, project.id))
			.all()
			.map((lot) => ({ ...lot, data: lotData(tx, lot.id)! }))
			.filter((lot) => lot.data.members.some((m) => m.candidate))
			.sort(
				(a, b) => b.data.members.length - a.data.members.length || a.label.localeCompare(b.label)
			);
		// A lot where a new selection can represent every welder can be shown passed and closed.
		const whole = (lot: (typeof lots)[number], seed: number) =>
			proposeSelection({
				members: lot.data.members,
				selections: lot.data.selections,
				percent: lot.data.lot.percent,
				everyWelder: lot.data.lot.everyWelder,
				seed
			}).unrepresentable.length === 0;
		const progressive = lots[0];
		const closed = lots.find((lot) => lot !== progressive && whole(lot, 20262));
		const sampled = lots.find((lot) => lot !== progressive && lot !== closed);
		const top = (lotId: number, seed: number) => {
			try {
				commitIn(tx, project.id, lotId, { seed, swaps: [] }, inspector, (at += DAY / 4));
			} catch {
				// The sample is met already: nothing to add.
			}
		};

		// Under progressive examination: a reject in the sample called two tracers of the
		// welder's work; one has passed, the other waits.
		if (progressive) {
			top(progressive.id, 20261);
			const data = lotData(tx, progressive.id)!;
			const byJoint = new Map(data.members.map((m) => [m.jointId, m]));
			const welderOf = (jointId: number) => byJoint.get(jointId)?.welders[0];
			const selected = new Set(data.selections.map((s) => s.jointId));
			const firstWeld = (jointId: number) =>
				tx
					.select({ cycle: schema.joints.repairCycle })
					.from(schema.joints)
					.where(eq(schema.joints.id, jointId))
					.get()?.cycle === 0;
			const reject = data.selections.find(
				(s) =>
					isSample(s) &&
					s.result === null &&
					firstWeld(s.jointId) &&
					data.members.filter(
						(m) =>
							m.candidate &&
							!selected.has(m.jointId) &&
							m.welders.includes(welderOf(s.jointId) ?? -1)
					).length >= 2
			);
			for (const s of data.selections.filter((x) => isSample(x) && x.result === null)) {
				const welder = tx
					.select({ stamp: schema.welders.stamp })
					.from(schema.welders)
					.where(eq(schema.welders.id, welderOf(s.jointId) ?? -1))
					.get();
				if (s === reject) {
					const answer = result(
						tx,
						s.jointId,
						progressive.data.lot.method,
						'reject',
						inspector,
						(at += DAY / 4),
						project.units,
						{
							indications: [
								{
									type: 'incompletePenetration',
									length: project.units === 'metric' ? '12 mm' : '1/2',
									position: project.units === 'metric' ? '150 mm' : '6'
								}
							],
							welders: welder ? [welder.stamp] : undefined
						}
					);
					const first = answer.tracers[0];
					if (first)
						result(
							tx,
							first.jointId,
							progressive.data.lot.method,
							'accept',
							inspector,
							(at += DAY / 4),
							project.units
						);
				} else {
					result(
						tx,
						s.jointId,
						progressive.data.lot.method,
						'accept',
						inspector,
						(at += DAY / 4),
						project.units
					);
				}
			}
		}

		// Closed, its sample examined and passed: the welds not selected are accepted by it.
		if (closed) {
			top(closed.id, 20262);
			for (const s of lotData(tx, closed.id)!.selections.filter((x) => x.result === null))
				result(
					tx,
					s.jointId,
					closed.data.lot.method,
					'accept',
					inspector,
					(at += DAY / 4),
					project.units
				);
			closeIn(
				tx,
				project.id,
				closed.id,
				'Line complete: all welds made and examined.',
				admin,
				(at += DAY / 4)
			);
		}

		// Sampled: the selection is drawn and waits for the NDE contractor.
		if (sampled) top(sampled.id, 20263);
		// Every other lot stays open, its sample still to draw.
	}
}
