/**
 * The welder register page's form actions (add a welder, add or renew a process, deactivate),
 * posted as the browser posts them, against a real SQLite file with a factory project. The
 * rules are the API's: the same schemas, so a form refused here is refused there too.
 */
import { and, eq } from 'drizzle-orm';
import { beforeAll, describe, expect, it } from 'vitest';
import { db, schema } from '$lib/server/db';
import * as users from '$lib/server/users';
import { actions } from '../../src/routes/(app)/projects/[projectId=id]/welders/+page.server';
import { makeProject } from '../fixtures/projects';

type Action = (event: never) => Promise<unknown>;
interface Answer {
	status?: number;
	data?: { form: Sent };
	form?: Sent;
}
interface Sent {
	valid: boolean;
	errors: Record<string, string[] | undefined>;
	message?: { tone: string; text: string };
}

let projectId: number;
let foremanId: string;

beforeAll(async () => {
	const job = await makeProject();
	projectId = job.projectId;
	foremanId = job.users.foreman;
});

/** Post a form to an action; answers the HTTP status and the form superforms sends back. */
async function post(action: keyof typeof actions, fields: Record<string, string>) {
	const body = new FormData();
	for (const [name, value] of Object.entries(fields)) body.set(name, value);
	const answer = (await (actions[action] as unknown as Action)({
		request: new Request(`http://localhost/projects/${projectId}/welders?/${action}`, {
			method: 'POST',
			body
		}),
		params: { projectId: String(projectId) },
		locals: { user: users.principal(foremanId), projectId }
	} as never)) as Answer;
	return { status: answer.status ?? 200, form: (answer.data?.form ?? answer.form)! };
}

const welderByStamp = (stamp: string) =>
	db
		.select()
		.from(schema.welders)
		.where(and(eq(schema.welders.projectId, projectId), eq(schema.welders.stamp, stamp)))
		.get();
const processesOf = (welderId: number) =>
	db
		.select()
		.from(schema.welderQualifications)
		.where(eq(schema.welderQualifications.welderId, welderId))
		.all();

describe('adding a welder', () => {
	it('stores the welder with the first process typed on the same line', async () => {
		const answer = await post('create', {
			stamp: 'P21',
			name: 'Pat Quarrie',
			employer: 'Test contractor',
			process: 'gtaw',
			qualifiedOn: '2026-02-02',
			reference: 'WPQ-P21-01'
		});
		expect(answer.status).toBe(200);
		expect(answer.form.message).toEqual({ tone: 'ok', text: 'Welder P21 (Pat Quarrie) added.' });
		const welder = welderByStamp('P21')!;
		expect(welder).toMatchObject({ name: 'Pat Quarrie', employer: 'Test contractor' });
		expect(processesOf(welder.id)).toMatchObject([
			{ process: 'GTAW', qualifiedOn: '2026-02-02', reference: 'WPQ-P21-01' }
		]);
	});

	it('stores a welder with no process when none is typed', async () => {
		const answer = await post('create', { stamp: 'P22', name: 'Robin Ashdown' });
		expect(answer.status).toBe(200);
		expect(processesOf(welderByStamp('P22')!.id)).toEqual([]);
	});

	it('refuses a process without its date, and a blank stamp, with 400 and nothing stored', async () => {
		const undated = await post('create', { stamp: 'P23', name: 'Sam Orrell', process: 'SMAW' });
		expect(undated.status).toBe(400);
		expect(undated.form.errors.qualifiedOn).toEqual(['Give the date the process was qualified.']);
		expect(welderByStamp('P23')).toBeUndefined();
		const blank = await post('create', { stamp: '  ', name: 'No stamp' });
		expect(blank.status).toBe(400);
		expect(blank.form.errors.stamp?.[0]).toBe('Give the welder stamp.');
	});

	it('refuses a stamp already used on the project, in any case, with 409 on the stamp', async () => {
		const again = await post('create', { stamp: 'p21', name: 'Someone else' });
		expect(again.status).toBe(409);
		expect(again.form.errors.stamp?.[0]).toContain('Pat Quarrie');
		expect(welderByStamp('p21')).toBeUndefined();
	});
});

describe('adding or renewing a process', () => {
	it('records the process for the welder named', async () => {
		const welder = welderByStamp('P22')!;
		const answer = await post('qualify', {
			welderId: String(welder.id),
			process: 'smaw',
			qualifiedOn: '2026-03-09'
		});
		expect(answer.status).toBe(200);
		expect(answer.form.message?.text).toBe('SMAW qualification recorded.');
		expect(processesOf(welder.id)).toMatchObject([{ process: 'SMAW', qualifiedOn: '2026-03-09' }]);
	});

	it('answers 400 without a welder and 404 for one not on the project, storing nothing', async () => {
		const before = db.select().from(schema.welderQualifications).all().length;
		const missing = await post('qualify', { process: 'FCAW', qualifiedOn: '2026-03-09' });
		expect(missing.status).toBe(400);
		expect(missing.form.errors.welderId).toBeDefined();
		const unknown = await post('qualify', {
			welderId: '999999',
			process: 'FCAW',
			qualifiedOn: '2026-03-09'
		});
		expect(unknown.status).toBe(404);
		expect(unknown.form.errors.welderId?.[0]).toBe('There is no such welder on this project.');
		expect(db.select().from(schema.welderQualifications).all()).toHaveLength(before);
	});
});

describe('deactivating a welder', () => {
	it('marks the welder inactive and active again, and refuses an unknown status', async () => {
		const welder = welderByStamp('P21')!;
		const off = await post('status', { welderId: String(welder.id), status: 'inactive' });
		expect(off.form.message?.text).toBe('Welder marked inactive.');
		expect(welderByStamp('P21')!.status).toBe('inactive');
		await post('status', { welderId: String(welder.id), status: 'active' });
		expect(welderByStamp('P21')!.status).toBe('active');
		const bad = await post('status', { welderId: String(welder.id), status: 'retired' });
		expect(bad.status).toBe(400);
		expect(bad.form.errors.status?.[0]).toBe('The status is active or inactive.');
		expect(welderByStamp('P21')!.status).toBe('active');
	});
});
