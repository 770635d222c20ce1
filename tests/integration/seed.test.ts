import { count, eq, isNotNull } from 'drizzle-orm';
import { beforeAll, describe, expect, it } from 'vitest';
import { db, schema } from '$lib/server/db';
import { seedIfEmpty } from '$lib/server/demo/seed';
import { stateInput } from '$lib/server/joints';
import { passProcesses } from '$lib/server/welds';
import * as storage from '$lib/server/storage';
import { deriveJointState, JOINT_STATES } from '$lib/joint-state';
import { verifyPassword } from '$lib/server/passwords';
import { PDFDocument } from 'pdf-lib';
import { countsTable, directCounts } from '../fixtures/state-counts';

describe('demo seed', () => {
	let first: Awaited<ReturnType<typeof seedIfEmpty>>;
	beforeAll(async () => {
		first = await seedIfEmpty();
	}, 120_000);

	it('fills an empty database once, and leaves a filled one alone', async () => {
		expect(first.seeded).toBe(true);
		const again = await seedIfEmpty();
		expect(again.seeded).toBe(false);
		expect(db.select({ n: count() }).from(schema.projects).get()?.n).toBe(2);
	});

	it('has one account per role, each with a strong password hash', async () => {
		const users = db.select().from(schema.users).all();
		expect(users.map((u) => u.email).sort()).toEqual([
			'admin@tacksheet.test',
			'doccon@tacksheet.test',
			'foreman@tacksheet.test',
			'inspector2@tacksheet.test',
			'inspector@tacksheet.test',
			'turnover@tacksheet.test',
			'viewer@tacksheet.test'
		]);
		for (const user of users) expect(user.passwordHash).toMatch(/^scrypt\$131072\$8\$1\$/);
		const inspector = users.find((u) => u.email === 'inspector@tacksheet.test')!;
		expect(await verifyPassword('tacksheet-demo', inspector.passwordHash)).toBe(true);
		expect(await verifyPassword('wrong', inspector.passwordHash)).toBe(false);
		const roles = db
			.selectDistinct({ role: schema.memberships.role })
			.from(schema.memberships)
			.all();
		expect(roles.map((r) => r.role).sort()).toEqual([
			'doc_controller',
			'foreman',
			'inspector',
			'turnover',
			'viewer'
		]);
	});

	it('has one imperial and one metric project with about a dozen drawings', () => {
		const projects = db.select().from(schema.projects).all();
		expect(projects.map((p) => p.units).sort()).toEqual(['imperial', 'metric']);
		const drawings = db.select({ n: count() }).from(schema.drawings).get()!.n;
		expect(drawings).toBeGreaterThanOrEqual(11);
		expect(drawings).toBeLessThanOrEqual(14);
		const superseded = db
			.select()
			.from(schema.revisions)
			.where(eq(schema.revisions.status, 'superseded'))
			.all();
		expect(superseded.length).toBeGreaterThanOrEqual(1);
		const rotated = db.select().from(schema.pages).where(eq(schema.pages.rotation, 90)).all();
		expect(rotated.length).toBeGreaterThanOrEqual(1);
	});

	it('stores every revision as a real PDF whose pages match the rows', async () => {
		const revisions = db.select().from(schema.revisions).all();
		for (const revision of revisions) {
			const bytes = await storage.readAll(revision.fileKey);
			expect(storage.sha256(bytes)).toBe(revision.sha256);
			expect(bytes.byteLength).toBe(revision.bytes);
			const pdf = await PDFDocument.load(bytes);
			expect(pdf.getPageCount()).toBe(revision.pageCount);
			const pages = db
				.select()
				.from(schema.pages)
				.where(eq(schema.pages.revisionId, revision.id))
				.all();
			for (const page of pages) {
				const pdfPage = pdf.getPage(page.pageIndex);
				expect(pdfPage.getRotation().angle).toBe(page.rotation);
				expect(page.x1 - page.x0).toBeCloseTo(pdfPage.getWidth(), 1);
			}
		}
	});

	it('spreads about 150 joints over every state, and the cached state agrees with the records', () => {
		const joints = db.select().from(schema.joints).all();
		expect(joints.length).toBeGreaterThanOrEqual(130);
		expect(joints.length).toBeLessThanOrEqual(180);
		const seen = new Set(joints.map((j) => j.state));
		for (const state of JOINT_STATES) expect(seen, state).toContain(state);
		for (const joint of joints) {
			expect(deriveJointState(stateInput(joint.id)!).state, joint.number).toBe(joint.state);
		}
	});

	it('keeps the per-drawing state counts equal to a direct count of the joints', () => {
		expect(countsTable()).toEqual(directCounts());
		expect(countsTable().length).toBeGreaterThan(0);
	});

	it('puts every live joint on the current revision of its drawing', () => {
		const pins = db
			.select({ jointId: schema.pins.jointId, status: schema.revisions.status })
			.from(schema.pins)
			.innerJoin(schema.revisions, eq(schema.revisions.id, schema.pins.revisionId))
			.all();
		const onCurrent = new Set(pins.filter((p) => p.status === 'current').map((p) => p.jointId));
		for (const joint of db.select().from(schema.joints).all()) {
			if (joint.state !== 'void') expect(onCurrent.has(joint.id), joint.number).toBe(true);
		}
	});

	it('has welders with stamps and qualifications, and inspections signed by inspectors', () => {
		expect(db.select({ n: count() }).from(schema.welders).get()!.n).toBeGreaterThanOrEqual(6);
		expect(
			db.select({ n: count() }).from(schema.welderQualifications).get()!.n
		).toBeGreaterThanOrEqual(10);
		const signed = db
			.select({ email: schema.users.email })
			.from(schema.inspections)
			.innerJoin(schema.users, eq(schema.users.id, schema.inspections.inspectorId))
			.groupBy(schema.users.email)
			.all();
		expect(signed.map((s) => s.email).sort()).toEqual([
			'inspector2@tacksheet.test',
			'inspector@tacksheet.test'
		]);
		const voided = db.select().from(schema.joints).where(isNotNull(schema.joints.voidReason)).all();
		expect(voided.length).toBeGreaterThan(0);
	});

	it("keeps each welder's last use of a process equal to their latest seeded weld in it", () => {
		const passes = db
			.select({
				welderId: schema.weldWelders.welderId,
				pass: schema.weldWelders.pass,
				process: schema.welds.process,
				weldedOn: schema.welds.weldedOn
			})
			.from(schema.weldWelders)
			.innerJoin(schema.welds, eq(schema.welds.id, schema.weldWelders.weldId))
			.all();
		const latest = new Map<string, string>();
		for (const row of passes) {
			const process = passProcesses(row.process)![row.pass];
			const key = `${row.welderId} ${process}`;
			if ((latest.get(key) ?? '') < row.weldedOn) latest.set(key, row.weldedOn);
		}
		expect(latest.size).toBeGreaterThanOrEqual(8);
		const qualifications = db.select().from(schema.welderQualifications).all();
		let checked = 0;
		for (const q of qualifications) {
			const seeded = latest.get(`${q.welderId} ${q.process}`);
			if (!seeded) continue;
			expect(q.lastUsedOn, `welder ${q.welderId} ${q.process}`).toBe(seeded);
			checked++;
		}
		// Every seeded pass is by a welder qualified for its process.
		expect(checked).toBe(latest.size);
		// The scenario's one lapsing qualification (B31, SMAW, last used in June) stays unused, so
		// the register still shows it running out; ASME IX QW-322.1(a), six months without the process.
		const b31 = db.select().from(schema.welders).where(eq(schema.welders.stamp, 'B31')).get()!;
		const smaw = qualifications.find((q) => q.welderId === b31.id && q.process === 'SMAW')!;
		expect(smaw.lastUsedOn).toBe('2026-06-12');
	});
});
