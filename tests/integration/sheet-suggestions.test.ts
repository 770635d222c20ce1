/**
 * Weld numbers found on the sheet, end to end: revision 0 of an invented isometric with its
 * weld numbers printed in bubbles is uploaded, read in the background, and its suggestions are
 * accepted all at once; revision 1 moves three labels with their welds, deletes two and adds
 * two. The upload answer and the reading say exactly which pins stayed, moved and were flagged,
 * and the new numbers are offered as suggestions. Over the API routes themselves.
 */
import { and, eq } from 'drizzle-orm';
import { beforeAll, describe, expect, it } from 'vitest';
import { db, schema } from '$lib/server/db';
import * as drawings from '$lib/server/drawings';
import * as joints from '$lib/server/joints';
import * as sheetReadings from '$lib/server/sheet-readings';
import * as users from '$lib/server/users';
import { newDrawingSchema } from '$lib/schemas/drawing';
import { makeProject, stagedPdf, type MadeProject } from '../fixtures/projects';
import { familySpec } from '../fixtures/iso-drawings/families';
import { measuringFonts, metricsOf } from '../fixtures/iso-drawings/fonts';
import { writePdf } from '../fixtures/iso-drawings/pdf';
import { rasterOnly } from '../fixtures/iso-drawings/raster';
import { reviseSheet, type RevisionPlan } from '../fixtures/iso-drawings/revise';
import { drawSheet } from '../fixtures/iso-drawings/sheet';
import {
	GET as getSuggestions,
	POST as rereadSuggestions
} from '../../src/routes/api/revisions/[revisionId=id]/suggestions/+server';
import { POST as acceptSuggestions } from '../../src/routes/api/revisions/[revisionId=id]/suggestions/accept/+server';
import { POST as dismissSuggestions } from '../../src/routes/api/revisions/[revisionId=id]/suggestions/dismiss/+server';
import { POST as postRevision } from '../../src/routes/api/projects/[projectId=id]/drawings/[drawingId=id]/revisions/+server';
import * as staged from '$lib/server/staged-uploads';

type Handler = (event: unknown) => Response | Promise<Response>;

let job: MadeProject;

beforeAll(async () => {
	job = await makeProject({ rule: { shopPrefix: '', fieldPrefix: 'FW-' } });
});

async function call(
	handler: unknown,
	params: Record<string, string>,
	body?: unknown,
	userId = job.users.inspector
) {
	const response = await (handler as Handler)({
		params,
		request: new Request('http://localhost/api/x', {
			method: body === undefined ? 'GET' : 'POST',
			...(body !== undefined
				? { headers: { 'content-type': 'application/json' }, body: JSON.stringify(body) }
				: {})
		}),
		locals: { user: users.principal(userId), projectId: job.projectId }
	});
	return { status: response.status, body: await response.json() };
}

async function register(number: string, bytes: Uint8Array) {
	const { drawing, revisionId } = await drawings.create(
		job.projectId,
		newDrawingSchema.parse({ number, kind: 'isometric', title: 'Test isometric' }),
		stagedPdf(bytes, `${number}.pdf`),
		job.users.doc_controller
	);
	await sheetReadings.idle();
	return { drawingId: drawing.id, revisionId };
}

const keys = (items: { number: string }[]) => items.map((i) => i.number).sort();

describe('a revision with text labels', () => {
	it('is read at upload; accept all; the next revision carries, moves and flags exactly', async () => {
		const metrics = metricsOf(await measuringFonts());
		const model = drawSheet(familySpec('iso-circles', 0), metrics);
		const numbers = model.labels.map((l) => l.number);
		const bare = numbers.filter((n) => /^\d\d$/.test(n));
		const plan: RevisionPlan = {
			move: [numbers[2], numbers[7], numbers[11]],
			remove: [numbers[4], numbers[9]],
			add: [
				{ like: bare[0], number: '98', printed: '98' },
				{ like: bare[1], number: '97', printed: '97' }
			]
		};
		const { drawingId, revisionId } = await register(
			'TS-ISO-0001',
			(await writePdf([model])).bytes
		);

		const first = await call(getSuggestions, { revisionId: String(revisionId) });
		expect(first.status).toBe(200);
		expect(first.body.status).toBe('done');
		expect(first.body.textLayer).toBe(true);
		// The finder's own recall is measured in sheet-finder.test.ts; here every label it
		// found on this sheet is offered once, each at a number printed on it.
		expect(first.body.items.length).toBeGreaterThanOrEqual(numbers.length - 1);
		for (const item of first.body.items) expect(numbers).toContain(item.number);
		for (const n of [...plan.move, ...plan.remove]) expect(keys(first.body.items)).toContain(n);

		const accepted = await call(
			acceptSuggestions,
			{ revisionId: String(revisionId) },
			{ all: true, joint: { kind: 'butt', location: 'shop', criteriaSetId: 'asme-b31.3-normal' } }
		);
		expect(accepted.status).toBe(201);
		expect(accepted.body.items).toHaveLength(first.body.items.length);
		expect(accepted.body.items[0].joint).toMatchObject({ kind: 'butt', state: 'awaiting_fitup' });
		const placed = accepted.body.items.length as number;
		// Accepted numbers are not offered again, nor can they be accepted twice.
		expect((await call(getSuggestions, { revisionId: String(revisionId) })).body.items).toEqual([]);
		const twice = await call(
			acceptSuggestions,
			{ revisionId: String(revisionId) },
			{ numbers: [plan.move[0]] }
		);
		expect(twice.status).toBe(409);

		// Revision 1 through the API route, as the upload stage hands it over.
		const revised = reviseSheet(model, plan, metrics);
		const token = 'rev1-upload-token';
		staged.stage(token, stagedPdf((await writePdf([revised.model])).bytes, 'rev1.pdf'));
		const upload = await call(
			postRevision,
			{ projectId: String(job.projectId), drawingId: String(drawingId) },
			{ staged: token, fields: { label: '1', note: 'Three welds moved, two deleted, two added' } },
			job.users.doc_controller
		);
		expect(upload.status).toBe(201);
		expect(upload.body).toMatchObject({
			pinsCarried: placed,
			pinsInPlace: placed - 5,
			pinsMoved: 3,
			pinsFlagged: 2,
			reading: 'done'
		});
		const rev1 = upload.body.revision.id as number;
		const pins = db
			.select({ number: schema.joints.number, pin: schema.pins })
			.from(schema.pins)
			.innerJoin(schema.joints, eq(schema.joints.id, schema.pins.jointId))
			.where(eq(schema.pins.revisionId, rev1))
			.all();
		for (const { number, pin } of pins) {
			if (plan.move.includes(number))
				expect(pin, number).toMatchObject({ needsReview: true, reviewReason: 'moved' });
			else if (plan.remove.includes(number))
				expect(pin, number).toMatchObject({ needsReview: true, reviewReason: 'missing' });
			else expect(pin, number).toMatchObject({ needsReview: false, reviewReason: null });
		}
		const next = await call(getSuggestions, { revisionId: String(rev1) });
		expect(keys(next.body.items)).toEqual(['97', '98']);
		expect(next.body.carried).toEqual({ inPlace: placed - 5, moved: 3, flagged: 2 });
	}, 120_000);
});

describe('suggestions one by one', () => {
	it('accepts some with defaults, dismisses others, and never suggests a number on the drawing', async () => {
		const metrics = metricsOf(await measuringFonts());
		const model = drawSheet(familySpec('iso-circles', 1), metrics);
		const { drawingId, revisionId } = await register(
			'TS-ISO-0002',
			(await writePdf([model])).bytes
		);
		const found = (await call(getSuggestions, { revisionId: String(revisionId) })).body.items as {
			number: string;
			x: number;
			y: number;
			target: { x: number; y: number } | null;
		}[];
		expect(found.length).toBeGreaterThan(6);
		const [a, b, c, d] = found;

		const one = await call(
			acceptSuggestions,
			{ revisionId: String(revisionId) },
			{ numbers: [a.number], joint: { location: 'field', kind: 'socket' } }
		);
		expect(one.status).toBe(201);
		const pin = one.body.items[0].pin;
		const at = a.target ?? a;
		expect([pin.x, pin.y]).toEqual([at.x, at.y]);
		expect(one.body.items[0].joint).toMatchObject({
			number: a.number,
			kind: 'socket',
			location: 'field'
		});

		const dismissed = await call(
			dismissSuggestions,
			{ revisionId: String(revisionId) },
			{ numbers: [b.number] }
		);
		expect(dismissed).toMatchObject({ status: 200, body: { dismissed: 1 } });

		// Placed by hand with the printed number: no longer a suggestion.
		joints.place(
			{ revisionId, pageIndex: 0, x: 300, y: 300, number: c.number, joint: {} },
			job.users.inspector
		);
		const left = keys((await call(getSuggestions, { revisionId: String(revisionId) })).body.items);
		expect(left).not.toContain(a.number);
		expect(left).not.toContain(b.number);
		expect(left).not.toContain(c.number);
		expect(left).toContain(d.number);

		// Neither half-applied: one unknown number refuses the whole request.
		const mixed = await call(
			acceptSuggestions,
			{ revisionId: String(revisionId) },
			{ numbers: [d.number, 'NOPE-1'] }
		);
		expect(mixed.status).toBe(409);
		expect(
			db
				.select()
				.from(schema.joints)
				.where(and(eq(schema.joints.drawingId, drawingId), eq(schema.joints.number, d.number)))
				.get()
		).toBeUndefined();
		const bad = await call(acceptSuggestions, { revisionId: String(revisionId) }, {});
		expect(bad.status).toBe(400);

		// Reading again keeps what was decided.
		const again = await call(rereadSuggestions, { revisionId: String(revisionId) }, {});
		expect(again.status).toBe(202);
		await sheetReadings.idle();
		const reread = keys(
			(await call(getSuggestions, { revisionId: String(revisionId) })).body.items
		);
		expect(reread).toEqual(left);
	}, 120_000);
});

describe('a scanned sheet', () => {
	it('says plainly that it has no text to read', async () => {
		const metrics = metricsOf(await measuringFonts());
		const model = drawSheet(familySpec('iso-circles', 2), metrics);
		const scan = await rasterOnly((await writePdf([model])).bytes);
		const { revisionId } = await register('TS-ISO-0003', scan);
		const answer = await call(getSuggestions, { revisionId: String(revisionId) });
		expect(answer.body).toMatchObject({ status: 'done', textLayer: false, items: [] });
	}, 120_000);
});
