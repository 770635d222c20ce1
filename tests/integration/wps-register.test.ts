/**
 * The WPS register through its API routes and page action, against a real SQLite file with a
 * factory project: unique number + revision per project, versions on change, the audit trail
 * before → after, and joints typed with a WPS number linked when that WPS is approved. The
 * procedures are invented.
 */
import { and, eq } from 'drizzle-orm';
import { beforeAll, describe, expect, it } from 'vitest';
import { db, schema } from '$lib/server/db';
import * as users from '$lib/server/users';
import * as wps from '$lib/server/wps';
import { GET, POST } from '../../src/routes/api/projects/[projectId=id]/wps/+server';
import { PATCH } from '../../src/routes/api/wps/[wpsId=id]/+server';
import { actions } from '../../src/routes/(app)/projects/[projectId=id]/wps/+page.server';
import { makeProject, type MadeProject } from '../fixtures/projects';
import { makeJoint } from '../fixtures/joints';

type Handler = (event: never) => Response | Promise<Response>;

let job: MadeProject;
let other: MadeProject;

beforeAll(async () => {
	job = await makeProject({ units: 'metric' });
	other = await makeProject({ units: 'imperial' });
});

const pipeWps = {
	number: 'WPS-PX-02',
	revision: '0',
	status: 'draft',
	processes: ['GTAW', 'SMAW'],
	materialGroups: '1.1',
	thicknessMin: '3',
	thicknessMax: '20 mm',
	rootOpeningMin: '2',
	rootOpeningMax: '4',
	bevelAngleMin: '30',
	bevelAngleMax: '35',
	preheatMin: '10',
	pqrs: 'PQR-7'
};

function call(
	handler: unknown,
	init: { body?: unknown; params?: object; user?: string; projectId?: number }
) {
	const projectId = init.projectId ?? job.projectId;
	return (handler as Handler)({
		request: new Request('http://localhost/api/x', {
			method: init.body === undefined ? 'GET' : 'POST',
			headers: { 'content-type': 'application/json' },
			body: init.body === undefined ? undefined : JSON.stringify(init.body)
		}),
		params: { projectId: String(projectId), ...init.params },
		locals: { user: users.principal(init.user ?? job.users.admin), projectId }
	} as never);
}

describe('the WPS register API', () => {
	let id: number;

	it('adds a WPS read in the project units, with its version', async () => {
		const response = await call(POST, { body: pipeWps });
		expect(response.status).toBe(201);
		const created = await response.json();
		expect(created).toMatchObject({
			number: 'WPS-PX-02',
			revision: '0',
			status: 'draft',
			processes: ['GTAW', 'SMAW'],
			version: 1,
			ranges: { rootOpening: { min: { value: 2, text: '2' }, max: { value: 4, text: '4' } } }
		});
		id = created.id;
		const audit = db
			.select()
			.from(schema.auditEvents)
			.where(and(eq(schema.auditEvents.entity, 'wps'), eq(schema.auditEvents.entityId, String(id))))
			.all();
		expect(audit.map((a) => a.action)).toEqual(['create']);
	});

	it('refuses the same number and revision again in the project (409), in any case', async () => {
		const response = await call(POST, { body: { ...pipeWps, number: 'wps-px-02' } });
		expect(response.status).toBe(409);
		expect((await response.json()).field).toBe('number');
	});

	it('takes the same number and revision in another project', async () => {
		const response = await call(POST, {
			body: {
				...pipeWps,
				thicknessMin: '1/8 in',
				thicknessMax: '3/4 in',
				rootOpeningMin: '2 mm',
				rootOpeningMax: '4 mm'
			},
			projectId: other.projectId
		});
		expect(response.status).toBe(201);
	});

	it('names the field it cannot read, and stores nothing', async () => {
		const response = await call(POST, {
			body: { ...pipeWps, revision: '9', bevelAngleMin: '40', bevelAngleMax: '30' }
		});
		expect(response.status).toBe(400);
		expect((await response.json()).field).toBe('bevelAngleMin');
		expect(wps.list(job.projectId).map((r) => r.revision)).toEqual(['0']);
	});

	it('changes a WPS on its version, auditing before → after; a stale version is 409', async () => {
		const response = await call(PATCH, {
			body: { version: 1, rootOpeningMax: '3.5', status: 'approved' },
			params: { wpsId: String(id) }
		});
		expect(response.status).toBe(200);
		const changed = await response.json();
		expect(changed.version).toBe(2);
		expect(changed.ranges.rootOpening.max.value).toBe(3.5);
		const audit = db
			.select()
			.from(schema.auditEvents)
			.where(and(eq(schema.auditEvents.entity, 'wps'), eq(schema.auditEvents.action, 'update')))
			.all()
			.at(-1)!;
		expect(audit.before).toEqual({ rootOpeningMax: '4', status: 'draft' });
		expect(audit.after).toEqual({ rootOpeningMax: '3.5', status: 'approved' });

		const stale = await call(PATCH, {
			body: { version: 1, title: 'late' },
			params: { wpsId: String(id) }
		});
		expect(stale.status).toBe(409);
	});

	it('lists the register for any member', async () => {
		const response = await call(GET, { user: job.users.viewer });
		const { items } = await response.json();
		expect(items.map((i: { label: string }) => i.label)).toEqual(['WPS-PX-02 rev 0']);
	});
});

describe('joints typed with a WPS number', () => {
	it('name the WPS of the register once it is approved; unmatched text stays as typed', async () => {
		const typed = makeJoint(job.drawing, { wps: 'WPS-PX-07 GTAW' });
		const untouched = makeJoint(job.drawing, { wps: 'site procedure 12' });
		const response = await call(POST, {
			body: { ...pipeWps, number: 'WPS-PX-07', status: 'approved' }
		});
		expect(response.status).toBe(201);
		const created = await response.json();
		const rowOf = (jointId: number) =>
			db.select().from(schema.joints).where(eq(schema.joints.id, jointId)).get()!;
		expect(rowOf(typed.joint.id).wpsId).toBe(created.id);
		expect(rowOf(typed.joint.id).wps).toBe('WPS-PX-07 GTAW');
		expect(rowOf(untouched.joint.id).wpsId).toBeNull();
		expect(rowOf(untouched.joint.id).wps).toBe('site procedure 12');
	});
});

describe('the register page', () => {
	async function post(fields: Record<string, string>, user = job.users.admin) {
		const body = new FormData();
		for (const [name, value] of Object.entries(fields)) body.set(name, value);
		const answer = (await (actions.save as unknown as (e: never) => Promise<unknown>)({
			request: new Request(`http://localhost/projects/${job.projectId}/wps?/save`, {
				method: 'POST',
				body
			}),
			params: { projectId: String(job.projectId) },
			locals: { user: users.principal(user), projectId: job.projectId }
		} as never)) as {
			status?: number;
			data?: { form: { errors: Record<string, string[]>; message?: { text: string } } };
			form?: { errors: Record<string, string[]>; message?: { text: string } };
		};
		return { status: answer.status ?? 200, form: (answer.data?.form ?? answer.form)! };
	}

	it('adds a WPS from the form', async () => {
		const { status, form } = await post({
			number: 'WPS-PX-09',
			revision: 'A',
			status: 'approved',
			processes: 'FCAW',
			thicknessMin: '6',
			thicknessMax: '40'
		});
		expect(status).toBe(200);
		expect(form.message?.text).toBe('WPS WPS-PX-09 rev A added to the register.');
	});

	it('puts each problem on its own field and stores nothing', async () => {
		const { status, form } = await post({
			number: 'WPS-PX-10',
			revision: '0',
			processes: '',
			thicknessMin: 'thick',
			preheatMin: '5000'
		});
		expect(status).toBe(400);
		expect(Object.keys(form.errors).sort()).toEqual(['preheatMin', 'processes', 'thicknessMin']);
		expect(wps.list(job.projectId).some((r) => r.number === 'WPS-PX-10')).toBe(false);
	});
});
describe('a WPS register imported from CSV', () => {
	const good = [
		'WPS number,Revision,Status,Processes,Thickness min,Thickness max,Root opening min,Root opening max',
		'WPS-CSV-01,0,approved,GTAW/SMAW,3,20,2,4',
		'WPS-CSV-02,1,draft,FCAW,6,40,,'
	].join('\r\n');

	it('previews without storing, then adds every line in one go, audited', () => {
		const before = wps.list(job.projectId).length;
		const preview = wps.importCsv(job.projectId, good, { apply: false, userId: job.users.admin });
		expect(preview).toMatchObject({ ok: true, problems: [] });
		expect(preview.rows.map((r) => r.label)).toEqual(['WPS-CSV-01 rev 0', 'WPS-CSV-02 rev 1']);
		expect(wps.list(job.projectId).length).toBe(before);

		const applied = wps.importCsv(job.projectId, good, { apply: true, userId: job.users.admin });
		expect(applied.ok).toBe(true);
		expect(wps.list(job.projectId).length).toBe(before + 2);
		const created = db
			.select()
			.from(schema.auditEvents)
			.where(and(eq(schema.auditEvents.entity, 'wps'), eq(schema.auditEvents.action, 'create')))
			.all();
		expect(created.some((a) => (a.after as { number: string }).number === 'WPS-CSV-02')).toBe(true);
	});

	it('stores nothing when one line is bad, naming its line and column', () => {
		const before = wps.list(job.projectId).length;
		const bad = [
			'WPS number,Revision,Processes,Thickness min,Thickness max',
			'WPS-CSV-10,0,GTAW,3,20',
			'WPS-CSV-11,0,GTAW,20,3',
			'WPS-CSV-12,0,SMAW,3,20'
		].join('\n');
		const result = wps.importCsv(job.projectId, bad, { apply: true, userId: job.users.admin });
		expect(result.ok).toBe(false);
		expect(result.problems).toEqual([
			expect.objectContaining({ line: 3, column: 'Thickness min' })
		]);
		expect(wps.list(job.projectId).length).toBe(before);
	});

	it('refuses a line whose WPS is already in the register', () => {
		const result = wps.importCsv(job.projectId, good, { apply: true, userId: job.users.admin });
		expect(result.ok).toBe(false);
		expect(result.problems.map((p) => [p.line, p.column])).toEqual([
			[2, 'WPS number'],
			[3, 'WPS number']
		]);
	});

	it('is previewed and applied by the page actions, a manager only by the route table', async () => {
		const csv = good.replace(/CSV-0/g, 'CSV-3');
		const send = async (action: 'preview' | 'import') => {
			const body = new FormData();
			body.set('file', new File([csv], 'wps.csv', { type: 'text/csv' }));
			return (await (actions[action] as unknown as (e: never) => Promise<unknown>)({
				request: new Request(`http://localhost/projects/${job.projectId}/wps?/${action}`, {
					method: 'POST',
					body
				}),
				params: { projectId: String(job.projectId) },
				locals: { user: users.principal(job.users.admin), projectId: job.projectId }
			} as never)) as { csvImport: { ok: boolean; applied: boolean; rows: unknown[] } };
		};
		const preview = await send('preview');
		expect(preview.csvImport).toMatchObject({ ok: true, applied: false });
		const applied = await send('import');
		expect(applied.csvImport).toMatchObject({ ok: true, applied: true });
		expect(wps.list(job.projectId).some((r) => r.number === 'WPS-CSV-31')).toBe(true);
	});
});
