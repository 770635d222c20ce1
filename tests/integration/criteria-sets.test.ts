/**
 * A project's own criteria sets: the module and the API routes against a real SQLite file with
 * an inch project made by the test factory. The base is ASME B31.3-2018 normal fluid service,
 * Table 341.3.2 criterion H: undercut ≤ 1 mm (1/32 in) and ≤ Tw/4, the lesser governing
 * (reference/standards.md §2a). The project limit of 1/64 in stands for a stricter clause of
 * an invented project specification, "PS-101".
 */
import { and, eq } from 'drizzle-orm';
import { beforeAll, describe, expect, it } from 'vitest';
import { db, schema } from '$lib/server/db';
import * as criteriaSets from '$lib/server/criteria-sets';
import * as inspections from '$lib/server/inspections';
import * as joints from '$lib/server/joints';
import * as users from '$lib/server/users';
import { ruleFor } from '$lib/server/route-access';
import { can } from '$lib/permissions';
import { evaluate, getCriteriaSet, ruleWords, type CriteriaSet } from '$lib/acceptance';
import { recordInspectionSchema } from '$lib/schemas/inspection';
import { criteriaSetSchema } from '$lib/schemas/criteria-set';
import type { JointFields } from '$lib/schemas/joint';
import {
	GET as listSets,
	POST as postSet
} from '../../src/routes/api/projects/[projectId=id]/criteria-sets/+server';
import { GET as getSet } from '../../src/routes/api/projects/[projectId=id]/criteria-sets/[setId]/+server';
import { POST as evaluatePost } from '../../src/routes/api/acceptance/evaluate/+server';
import { makeProject, type MadeProject } from '../fixtures/projects';
import { weldJoint } from '../fixtures/welders';
import { CLEAN, FITUP } from '../fixtures/readings';

type Handler = (event: never) => Response | Promise<Response>;

let adminId: string;
let inspectorId: string;
let foremanId: string;
let projectId: number;
let revisionId: number;
let members: MadeProject['users'];
/** A project our inspector is not a member of. */
let otherProject: number;

beforeAll(async () => {
	const job = await makeProject();
	members = job.users;
	({ admin: adminId, inspector: inspectorId, foreman: foremanId } = job.users);
	({ projectId, revisionId } = job.drawing);
	otherProject = (await makeProject({ units: 'metric' })).projectId;
});

const inches = (value: number) => value * 25.4;

// Factories ----------------------------------------------------------------------------------

let placed = 0;
/** A new butt joint: 6 in SCH 40, Tw = 0.280 in. */
function newJoint(fields: Partial<JointFields> = {}) {
	placed++;
	return joints.place(
		{
			revisionId,
			pageIndex: 0,
			x: 60 + placed * 3,
			y: 420,
			joint: {
				kind: 'butt',
				size: '6',
				thickness: '0.280 in',
				wps: 'WPS-CS-01 GTAW/SMAW',
				...fields
			}
		},
		inspectorId
	).joint;
}

/** Fit-up accepted and welded: the joint awaits its visual. */
function weldedJoint(criteriaSetId: string) {
	const joint = newJoint({ criteriaSetId });
	inspections.record(
		joint.id,
		recordInspectionSchema.parse({
			version: joints.row(joint.id)!.version,
			stage: 'fitup',
			readings: FITUP,
			decision: 'accept'
		}),
		inspectorId
	);
	weldJoint(projectId, joint.id, foremanId);
	return joint;
}

function visual(jointId: number, undercutDepth: string, decision: 'accept' | 'reject') {
	return inspections.record(
		jointId,
		recordInspectionSchema.parse({
			version: joints.row(jointId)!.version,
			stage: 'visual',
			readings: { ...CLEAN, undercutDepth },
			decision
		}),
		inspectorId
	).inspection;
}

async function api(handler: unknown, userId: string, body?: unknown, params = {}, search = '') {
	const url = `http://localhost/api/projects/${projectId}/criteria-sets${search}`;
	const response = await (handler as Handler)({
		params: { projectId: String(projectId), ...params },
		url: new URL(url),
		request: new Request(url, {
			method: body === undefined ? 'GET' : 'POST',
			headers: { 'content-type': 'application/json' },
			body: body === undefined ? undefined : JSON.stringify(body)
		}),
		locals: { user: users.principal(userId), projectId }
	} as never);
	return { status: response.status, body: await response.json() };
}

const STRICT_UNDERCUT = {
	id: 'ps-101-piping',
	name: 'PS-101 process piping',
	base: 'asme-b31.3-normal',
	overrides: {
		'undercut.depth': { type: 'max', max: '1/64', clause: 'PS-101 §6.4' }
	}
};

function auditRows(entityId: string) {
	return db
		.select()
		.from(schema.auditEvents)
		.where(
			and(eq(schema.auditEvents.entity, 'criteria_set'), eq(schema.auditEvents.entityId, entityId))
		)
		.orderBy(schema.auditEvents.id)
		.all();
}

// Tests ----------------------------------------------------------------------------------------

describe('the base a project derives from', () => {
	// ASME B31.3-2018 Table 341.3.2 criterion H, check value of reference §2a: Tw = 0.280 in
	// gives min(1/32, 0.070) = 1/32 in.
	it('holds undercut to 1/32 in on a 0.280 in wall, as Table 341.3.2 criterion H says', () => {
		const b313 = getCriteriaSet('asme-b31.3-normal')!;
		const joint = { kind: 'butt' as const, thickness: '0.280 in' };
		const depth = (undercutDepth: string) => {
			const result = evaluate(b313, joint, 'visual', { undercutDepth });
			if (!result.ok) throw new Error('unreadable');
			return result.findings.find((f) => f.check === 'undercut.depth')!;
		};
		expect(depth('1/32')).toMatchObject({ outcome: 'within', clause: expect.stringMatching(/H/) });
		expect(depth('1/32').limit).toBeCloseTo(inches(1 / 32), 9);
		expect(depth('3/64').outcome).toBe('outside');
		expect(ruleWords(b313.limits['undercut.depth']!.rule, 'mm', 'imperial')).toBe(
			'at most (the lesser of 1/32 in and 0.25 × thickness, none for longitudinal seams) at any length'
		);
		expect(ruleWords(b313.limits['undercut.depth']!.rule, 'mm', 'metric')).toBe(
			'at most (the lesser of 1 mm and 0.25 × thickness, none for longitudinal seams) at any length'
		);
	});
});

describe('a project set judges the joints that use it, and keeps each version', () => {
	let first: number;

	it('is created by the administrator from a built-in set, audited', async () => {
		const created = await api(postSet, adminId, STRICT_UNDERCUT);
		expect(created.status).toBe(201);
		expect(created.body).toMatchObject({
			id: 'ps-101-piping',
			name: 'PS-101 process piping',
			standard: 'ASME B31.3',
			edition: '2018',
			version: 1,
			baseId: 'asme-b31.3-normal',
			basedOn: { id: 'asme-b31.3-normal', version: 1 },
			changed: ['undercut.depth']
		});
		const undercut = created.body.limits.find(
			(l: { check: string }) => l.check === 'undercut.depth'
		);
		expect(undercut).toMatchObject({ clause: 'PS-101 §6.4', confidence: 'project' });
		// 1/64 in typed in the inch project, stored in mm as the engine judges.
		expect(undercut.rule.type).toBe('max');
		expect(undercut.rule.max).toBeCloseTo(inches(1 / 64), 12);
		// The other limits are the base's.
		const crack = created.body.limits.find((l: { check: string }) => l.check === 'crack');
		expect(crack.clause).toBe('Table 341.3.2, crack, criterion A');

		const [row] = auditRows('ps-101-piping');
		expect(row).toMatchObject({ action: 'create', projectId, userId: adminId, before: null });
		expect(row.after).toMatchObject({ version: 1, base: 'asme-b31.3-normal' });

		const listed = await api(listSets, inspectorId);
		expect(listed.status).toBe(200);
		expect(listed.body.items.map((s: { id: string }) => s.id)).toContain('ps-101-piping');
	});

	it('judges a visual by the project limit and stores the set and its version 1', () => {
		const joint = weldedJoint('ps-101-piping');
		// 1/32 in is within B31.3 criterion H but deeper than the project's 1/64 in.
		expect(() => visual(joint.id, '1/32', 'accept')).toThrow(
			/outside the limits of PS-101 process piping \(version 1, from ASME B31\.3 2018\)/
		);
		const inspection = visual(joint.id, '1/32', 'reject');
		first = inspection.id;
		expect(inspection).toMatchObject({
			verdict: 'outside',
			criteriaSetId: 'ps-101-piping',
			criteriaSetVersion: 1,
			againstVerdict: false
		});
		const finding = inspection.findings.find((f) => f.check === 'undercut.depth')!;
		expect(finding).toMatchObject({ outcome: 'outside', clause: 'PS-101 §6.4' });
		expect(finding.limit).toBeCloseTo(inches(1 / 64), 9);
		// The card's live verdict gets the same set with the joint.
		expect(joints.detail(joint.id)!.criteriaSet).toMatchObject({ id: 'ps-101-piping', version: 1 });
	});

	it('is revised to version 2; the older result keeps version 1, which stays resolvable', async () => {
		const stale = await api(postSet, adminId, {
			...STRICT_UNDERCUT,
			base: undefined,
			revises: 7
		});
		expect(stale).toMatchObject({ status: 409, body: { field: 'revises' } });

		const revised = await api(postSet, adminId, {
			id: 'ps-101-piping',
			name: 'PS-101 process piping rev B',
			revises: 1,
			overrides: {
				'undercut.depth': { type: 'max', max: '0.5 mm', clause: 'PS-101 rev B §6.4' }
			}
		});
		expect(revised.status).toBe(200);
		expect(revised.body).toMatchObject({
			version: 2,
			name: 'PS-101 process piping rev B',
			basedOn: { id: 'asme-b31.3-normal', version: 1 },
			versions: [{ version: 1 }, { version: 2 }]
		});

		const joint = weldedJoint('ps-101-piping');
		// 1/64 in = 0.40 mm is within rev B's 0.5 mm; 1/32 in = 0.79 mm still is not.
		const second = visual(joint.id, '1/64', 'accept');
		expect(second).toMatchObject({
			verdict: 'within',
			criteriaSetId: 'ps-101-piping',
			criteriaSetVersion: 2
		});
		const old = db.select().from(schema.inspections).where(eq(schema.inspections.id, first)).get()!;
		expect(old).toMatchObject({ criteriaSetVersion: 1, verdict: 'outside' });

		const v1 = criteriaSets.get(projectId, 'ps-101-piping', 1) as CriteriaSet;
		const v2 = criteriaSets.get(projectId, 'ps-101-piping') as CriteriaSet;
		expect(v1.limits['undercut.depth']?.clause).toBe('PS-101 §6.4');
		expect(v2).toMatchObject({ version: 2 });
		expect(v2.limits['undercut.depth']?.rule).toEqual({ type: 'max', max: 0.5 });

		const shown = await api(
			getSet,
			inspectorId,
			undefined,
			{ setId: 'ps-101-piping' },
			'?version=1'
		);
		expect(shown.status).toBe(200);
		expect(shown.body).toMatchObject({ id: 'ps-101-piping', version: 1 });

		const rows = auditRows('ps-101-piping');
		expect(rows.map((r) => r.action)).toEqual(['create', 'revise']);
		expect(rows[1]).toMatchObject({
			before: { version: 1, name: 'PS-101 process piping' },
			after: { version: 2, name: 'PS-101 process piping rev B' }
		});
	});

	it('refuses a revision that changes nothing', async () => {
		const same = await api(postSet, adminId, {
			id: 'ps-101-piping',
			name: 'PS-101 process piping rev B',
			revises: 2,
			overrides: { 'undercut.depth': { type: 'max', max: '0.5 mm', clause: 'PS-101 rev B §6.4' } }
		});
		expect(same).toMatchObject({ status: 400, body: { field: 'overrides' } });
	});

	it('can be derived from in turn, keeping its lineage', async () => {
		const child = await api(postSet, adminId, {
			id: 'ps-101-cyclic',
			name: 'PS-101 cyclic lines',
			base: 'ps-101-piping',
			overrides: { crack: { type: 'absent', clause: 'PS-101 §6.1' } }
		});
		expect(child.status).toBe(201);
		expect(child.body).toMatchObject({
			baseId: 'ps-101-piping@2',
			basedOn: { id: 'ps-101-piping', version: 2 },
			changed: ['crack']
		});
		const undercut = child.body.limits.find((l: { check: string }) => l.check === 'undercut.depth');
		expect(undercut.clause).toBe('PS-101 rev B §6.4');
	});
});

describe('who may change criteria, and bad input', () => {
	it('lets members read the sets and administrators alone change them', () => {
		const post = ruleFor('/api/projects/[projectId=id]/criteria-sets', 'POST', '');
		expect(post).toEqual({ access: 'project', action: 'criteria.manage' });
		const page = ruleFor('/(app)/projects/[projectId=id]/settings/criteria', 'GET', '');
		expect(page).toEqual({ access: 'project', action: 'criteria.manage' });
		for (const role of ['inspector', 'doc_controller', 'viewer'] as const) {
			const principal = users.principal(members[role])!;
			expect(can(principal, 'criteria.manage', projectId), role).toBe(false);
			expect(can(principal, 'project.read', projectId), role).toBe(true);
		}
		expect(can(users.principal(adminId)!, 'criteria.manage', projectId)).toBe(true);
	});

	it.each([
		[
			'an unknown check',
			{ overrides: { 'spatter.max': { type: 'max', max: '1/16', clause: 'PS-101 §7' } } },
			'overrides.spatter.max',
			/Unknown check "spatter.max"/
		],
		[
			'an empty clause',
			{ overrides: { 'undercut.depth': { type: 'max', max: '1/64', clause: '  ' } } },
			'overrides.undercut.depth.clause',
			/project specification clause/
		],
		[
			'an unreadable value',
			{ overrides: { 'undercut.depth': { type: 'max', max: 'deep', clause: 'PS-101 §6.4' } } },
			'overrides.undercut.depth.max',
			/cannot read "deep"/
		],
		[
			'a negative value',
			{ overrides: { 'undercut.depth': { type: 'max', max: '-1/64', clause: 'PS-101 §6.4' } } },
			'overrides.undercut.depth.max',
			/cannot be negative/
		],
		[
			'a rule the check cannot take',
			{ overrides: { crack: { type: 'max', max: '1/64', clause: 'PS-101 §6.1' } } },
			'overrides.crack.type',
			/crack takes absent/
		],
		['an id taken by a built-in set', { id: 'asme-b31.3-normal' }, 'id', /built-in/],
		['an id already used in the project', { id: 'ps-101-piping' }, 'id', /already has/],
		['a base the project does not have', { base: 'asme-b31.9' }, 'base', /asme-b31.9/],
		['an id with spaces', { id: 'ps 101' }, 'id', /letters, digits/]
	])('refuses %s with 400 or 409 naming the field', async (_what, change, field, message) => {
		const before = db.select().from(schema.criteriaSets).all().length;
		const answer = await api(postSet, adminId, { ...STRICT_UNDERCUT, id: 'ps-102', ...change });
		expect([400, 409]).toContain(answer.status);
		expect(answer.body.field).toBe(field);
		expect(answer.body.error).toMatch(message);
		expect(db.select().from(schema.criteriaSets).all().length).toBe(before);
	});

	it('reads the schema the same way for the settings page', () => {
		const parsed = criteriaSetSchema.safeParse({ ...STRICT_UNDERCUT, id: ' PS-103 ' });
		expect(parsed.success && parsed.data.id).toBe('ps-103');
	});

	it('refuses a joint given a set the project does not have', () => {
		expect(() => newJoint({ criteriaSetId: 'no-such-set' })).toThrow(
			/not a criteria set of this project/
		);
		try {
			newJoint({ criteriaSetId: 'no-such-set' });
		} catch (error) {
			expect(error).toMatchObject({ status: 400, field: 'joint.criteriaSetId' });
		}
	});

	it('gives a clear 409, not a crash, when a joint names a set that is gone', () => {
		const joint = newJoint();
		db.update(schema.joints)
			.set({ criteriaSetId: 'withdrawn-set' })
			.where(eq(schema.joints.id, joint.id))
			.run();
		let thrown: unknown;
		try {
			inspections.record(
				joint.id,
				recordInspectionSchema.parse({
					version: joints.row(joint.id)!.version,
					stage: 'fitup',
					readings: { rootOpening: '1/8' },
					decision: 'accept'
				}),
				inspectorId
			);
		} catch (error) {
			thrown = error;
		}
		expect(thrown).toMatchObject({ status: 409, field: 'criteriaSetId' });
		expect((thrown as Error).message).toMatch(/"withdrawn-set"/);
	});
});

describe('POST /api/acceptance/evaluate with a project', () => {
	async function evaluateAs(userId: string | null, body: unknown) {
		const response = await (evaluatePost as unknown as Handler)({
			request: new Request('http://localhost/api/acceptance/evaluate', {
				method: 'POST',
				headers: { 'content-type': 'application/json' },
				body: JSON.stringify(body)
			}),
			locals: { user: userId ? users.principal(userId) : null }
		} as never);
		return { status: response.status, body: await response.json() };
	}
	const request = {
		criteria: 'ps-101-piping',
		stage: 'visual',
		joint: { kind: 'butt', thickness: '0.280 in' },
		readings: { undercutDepth: '1/32' }
	};

	it('judges by a set of the project for a member', async () => {
		const answer = await evaluateAs(inspectorId, { ...request, projectId });
		expect(answer.status).toBe(200);
		expect(answer.body.criteria).toMatchObject({ id: 'ps-101-piping', version: 2 });
		expect(answer.body.verdict).toBe('outside');
	});

	it('keeps the built-in contract without a project, and hides projects from non-members', async () => {
		const builtInOnly = await evaluateAs(inspectorId, request);
		expect(builtInOnly.status).toBe(400);
		expect(builtInOnly.body).toMatchObject({ field: 'criteria' });
		const listed = builtInOnly.body.error.split('use one of: ')[1];
		expect(listed).toMatch(/asme-b31\.3-normal/);
		expect(listed).not.toMatch(/ps-101-piping/);

		const outsider = inspectorId;
		const hidden = await evaluateAs(outsider, { ...request, projectId: otherProject });
		expect(hidden).toMatchObject({ status: 404, body: { field: 'projectId' } });
	});
});
