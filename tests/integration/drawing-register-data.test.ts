/**
 * A drawing's register data (number, title, type, line, area, system / test pack) edited after
 * upload: over the API with the version last seen, and on the details page.
 */
import { and, eq } from 'drizzle-orm';
import { beforeAll, describe, expect, it } from 'vitest';
import { db, schema } from '$lib/server/db';
import * as users from '$lib/server/users';
import { makeDrawing, makeProject, type MadeProject } from '../fixtures/projects';
import {
	GET as getDrawing,
	PATCH as patchDrawing
} from '../../src/routes/api/drawings/[drawingId=id]/+server';
import { actions } from '../../src/routes/(app)/projects/[projectId=id]/drawings/[drawingId=id]/details/+page.server';

type Handler = (event: unknown) => Response | Promise<Response>;

let job: MadeProject;

beforeAll(async () => {
	job = await makeProject();
});

async function patch(drawingId: number, body: unknown, userId = job.users.doc_controller) {
	const response = await (patchDrawing as Handler)({
		params: { drawingId: String(drawingId) },
		request: new Request('http://localhost/api/drawings/1', {
			method: 'PATCH',
			headers: { 'content-type': 'application/json' },
			body: JSON.stringify(body)
		}),
		locals: { user: users.principal(userId), projectId: job.projectId }
	});
	return { status: response.status, body: await response.json() };
}

describe('PATCH /api/drawings/{drawingId}', () => {
	it('changes area, system, line, title and type with the version, and audits before and after', async () => {
		const drawing = await makeDrawing(job, { area: 'Area 1', system: 'Process' });
		const before = await (getDrawing as Handler)({
			params: { drawingId: String(drawing.drawingId) },
			locals: { user: users.principal(job.users.viewer), projectId: job.projectId }
		});
		const shown = await before.json();
		expect(shown.version).toBe(1);
		const answer = await patch(drawing.drawingId, {
			area: 'Area 7 – pipe rack',
			system: 'TP-0412',
			line: '4"-CW-2201-B2',
			title: 'Cooling water return',
			kind: 'shop',
			version: 1
		});
		expect(answer.status).toBe(200);
		expect(answer.body).toMatchObject({
			area: 'Area 7 – pipe rack',
			system: 'TP-0412',
			line: '4"-CW-2201-B2',
			kind: 'shop',
			version: 2
		});
		const trail = db
			.select()
			.from(schema.auditEvents)
			.where(
				and(
					eq(schema.auditEvents.entity, 'drawing'),
					eq(schema.auditEvents.entityId, String(drawing.drawingId)),
					eq(schema.auditEvents.action, 'update')
				)
			)
			.all();
		expect(trail).toHaveLength(1);
		expect(trail[0].before).toMatchObject({ area: 'Area 1', system: 'Process', kind: 'isometric' });
		expect(trail[0].after).toMatchObject({ area: 'Area 7 – pipe rack', system: 'TP-0412' });
	});

	it('refuses a stale version and a number another drawing holds (409), changing nothing', async () => {
		const a = await makeDrawing(job);
		const b = await makeDrawing(job);
		const stale = await patch(a.drawingId, { area: 'Area 9', version: 4 });
		expect(stale.status).toBe(409);
		expect(stale.body.field).toBe('version');
		const clash = await patch(a.drawingId, { number: b.number.toLowerCase(), version: 1 });
		expect(clash.status).toBe(409);
		expect(clash.body).toMatchObject({ field: 'number' });
		const row = db.select().from(schema.drawings).where(eq(schema.drawings.id, a.drawingId)).get()!;
		expect([row.number, row.area, row.version]).toEqual([a.number, 'Area 1', 1]);
	});

	it('answers bad input with 400 naming the field', async () => {
		const drawing = await makeDrawing(job);
		const bad = await patch(drawing.drawingId, { kind: 'sketch', version: 1 });
		expect(bad.status).toBe(400);
		expect(bad.body.field).toBe('kind');
		const noVersion = await patch(drawing.drawingId, { area: 'Area 2' });
		expect(noVersion.status).toBe(400);
		expect(noVersion.body.field).toBe('version');
	});
});

describe('the details page', () => {
	async function post(drawingId: number, fields: Record<string, string>) {
		const body = new FormData();
		for (const [k, v] of Object.entries(fields)) body.set(k, v);
		return (await actions.default({
			request: new Request('http://localhost/x', { method: 'POST', body }),
			locals: { user: users.principal(job.users.doc_controller), projectId: job.projectId },
			params: { projectId: String(job.projectId), drawingId: String(drawingId) }
		} as never)) as {
			form?: { valid: boolean; message?: string; errors: Record<string, string[]> };
		};
	}

	it('saves the register data and says so; a stale form is refused on its version', async () => {
		const drawing = await makeDrawing(job);
		const fields = {
			number: drawing.number,
			title: 'Firewater ring main',
			kind: 'isometric',
			line: '8"-FW-1001-C1',
			area: 'Area 3',
			system: 'TP-0099',
			version: '1'
		};
		const saved = await post(drawing.drawingId, fields);
		expect(saved.form?.message).toMatch(/Saved/);
		const row = db
			.select()
			.from(schema.drawings)
			.where(eq(schema.drawings.id, drawing.drawingId))
			.get()!;
		expect([row.area, row.system, row.line, row.version]).toEqual([
			'Area 3',
			'TP-0099',
			'8"-FW-1001-C1',
			2
		]);
		const stale = (await post(drawing.drawingId, { ...fields, area: 'Area 4' })) as unknown as {
			status: number;
			data: { form: { errors: Record<string, string[]> } };
		};
		expect(stale.status).toBe(409);
		expect(stale.data.form.errors.version?.[0]).toMatch(/changed drawing/);
	});
});
