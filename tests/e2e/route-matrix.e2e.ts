/**
 * Every page, form action and API route in src/routes, found by walking the tree, is asked
 * for without a session and as each demo role; the answer must be exactly what the route
 * table and the permissions module say. A route the table does not know fails the test.
 */
import fs from 'node:fs';
import path from 'node:path';
import { expect, request as newRequest, test, type APIRequestContext } from '@playwright/test';
import { ROUTES, type Rule } from '../../src/lib/server/route-access';
import { can, canGlobal, isMember, type Principal } from '../../src/lib/permissions';
import sharp from 'sharp';
import { BASE_URL, DEMO_USERS, readDatabase, signedInClient } from './support';

interface Endpoint {
	routeId: string;
	method: string;
	/** Form action name, for POSTs to a page. */
	action?: string;
}

const ROUTES_DIR = path.resolve('src/routes');

function discover(dir = ROUTES_DIR): Endpoint[] {
	const found: Endpoint[] = [];
	const entries = fs.readdirSync(dir, { withFileTypes: true });
	const routeId = '/' + path.relative(ROUTES_DIR, dir).split(path.sep).filter(Boolean).join('/');
	const names = entries.filter((e) => e.isFile()).map((e) => e.name);
	if (names.some((n) => /^\+page\.(svelte|server\.ts|ts)$/.test(n)))
		found.push({ routeId, method: 'GET' });
	const pageServer = names.find((n) => /^\+page\.server\.(ts|js)$/.test(n));
	if (pageServer) {
		const source = fs.readFileSync(path.join(dir, pageServer), 'utf8');
		const block = /export const actions = \{([\s\S]*?)\n\}/.exec(source)?.[1];
		if (block) {
			for (const match of block.matchAll(/^\t(\w+):/gm))
				found.push({ routeId, method: 'POST', action: match[1] });
		}
	}
	const server = names.find((n) => /^\+server\.(ts|js)$/.test(n));
	if (server) {
		const source = fs.readFileSync(path.join(dir, server), 'utf8');
		for (const match of source.matchAll(/export const (GET|POST|PUT|PATCH|DELETE)\b/g)) {
			found.push({ routeId, method: match[1] });
		}
	}
	for (const entry of entries)
		if (entry.isDirectory()) found.push(...discover(path.join(dir, entry.name)));
	return found;
}

function ruleOf(e: Endpoint): Rule | undefined {
	const rules = ROUTES[e.routeId];
	if (!rules) return undefined;
	return e.action ? rules.actions?.[e.action] : rules[e.method as 'GET'];
}

/** A concrete URL for a route id: groups dropped, parameters filled with demo ids. */
function urlOf(e: Endpoint, ids: Record<string, string>): string {
	const pathname =
		e.routeId
			.split('/')
			.filter((s) => s && !/^\(.*\)$/.test(s))
			.map((s) => s.replace(/^\[(\w+)(=\w+)?\]$/, (_, name: string) => ids[name] ?? '1'))
			.join('/') || '';
	const url = '/' + pathname;
	// The default action is posted to the page itself: `?/default` is a reserved name (400).
	return e.action && e.action !== 'default' ? `${url}?/${e.action}` : url;
}

const endpoints = discover();

test('every route in src/routes has an access rule, and every rule a route', () => {
	const unknown = endpoints
		.filter((e) => !ruleOf(e))
		.map((e) => `${e.method} ${e.routeId}${e.action ? ` ?/${e.action}` : ''}`);
	expect(unknown, 'routes missing from src/lib/server/route-access.ts').toEqual([]);
	const known = new Set(endpoints.map((e) => e.routeId));
	expect(
		Object.keys(ROUTES).filter((id) => !known.has(id)),
		'rules for routes that do not exist'
	).toEqual([]);
	expect(endpoints.length).toBeGreaterThan(15);
});

type Expectation = 'allowed' | 'signin' | 'forbidden' | 'hidden';

function expected(rule: Rule, principal: Principal | null, projectId: number): Expectation {
	if (rule.access === 'public') return 'allowed';
	if (!principal) return 'signin';
	if (rule.access === 'signed-in') return 'allowed';
	if (rule.access === 'global') return canGlobal(principal, rule.action) ? 'allowed' : 'forbidden';
	if (!isMember(principal, projectId)) return 'hidden';
	return can(principal, rule.action, projectId) ? 'allowed' : 'forbidden';
}

/** A stream of server-sent events never ends: read its status and headers, then hang up. */
async function askStream(client: APIRequestContext, url: string) {
	const { cookies } = await client.storageState();
	const abort = new AbortController();
	const response = await fetch(BASE_URL + url, {
		headers: {
			cookie: cookies.map((c) => `${c.name}=${c.value}`).join('; '),
			accept: 'text/event-stream'
		},
		redirect: 'manual',
		signal: abort.signal
	});
	abort.abort();
	return {
		status: () => response.status,
		headers: () =>
			({ location: response.headers.get('location') ?? undefined }) as Record<
				string,
				string | undefined
			>
	};
}

async function ask(client: APIRequestContext, e: Endpoint, url: string) {
	if (e.routeId.endsWith('/events')) return askStream(client, url);
	const headers = {
		origin: BASE_URL,
		accept: e.routeId.startsWith('/api/') ? 'application/json' : 'text/html'
	};
	const options = { headers, maxRedirects: 0, failOnStatusCode: false };
	if (e.method === 'GET') return client.get(url, options);
	if (e.action) return client.post(url, { ...options, form: {} });
	return client.fetch(url, { ...options, method: e.method, data: {} });
}

function check(
	status: number,
	location: string | undefined,
	want: Expectation,
	api: boolean,
	what: string
) {
	if (want === 'signin') {
		if (api) expect(status, what).toBe(401);
		else {
			expect(status, what).toBe(303);
			expect(location, what).toContain('/signin?returnTo=');
		}
	} else if (want === 'forbidden') expect(status, what).toBe(403);
	else if (want === 'hidden') expect(status, what).toBe(404);
	else {
		expect([401, 403], what).not.toContain(status);
		expect(location ?? '', what).not.toContain('/signin?returnTo=');
	}
}

const callers: { label: string; email: string | null; principal: Principal | null }[] = [
	{ label: 'no session', email: null, principal: null },
	...DEMO_USERS.map((u) => ({
		label: u.email,
		email: u.email,
		principal: {
			isAdmin: u.isAdmin ?? false,
			roles: Object.fromEntries(
				u.role
					? (u.projects ?? ['LBM-20', 'VFT-3']).map((code) => [code === 'LBM-20' ? 1 : 2, u.role!])
					: []
			)
		}
	}))
];

/** Real ids in each demo project, so every route parameter names something that exists. */
async function demoIds(): Promise<Record<number, Record<string, string>>> {
	const admin = await signedInClient('admin@tacksheet.test');
	const inspector = await signedInClient('inspector@tacksheet.test');
	const ids: Record<number, Record<string, string>> = {};
	for (const projectId of [1, 2]) {
		// A drawing still at its first revision, with pins: asking the matrix's POSTs of it (read
		// the sheet again) must not re-judge pins that other tests expect carried and flagged.
		const drawings = (
			await (await admin.get(`/api/projects/${projectId}/drawings?pageSize=100`)).json()
		).items as { id: number; currentRevision: { id: number; label: string } | null }[];
		let first = drawings[0];
		let pin = undefined as { jointId: number; pinId: number } | undefined;
		for (const drawing of drawings.filter((d) => d.currentRevision?.label === '0')) {
			const items = (
				await (await admin.get(`/api/revisions/${drawing.currentRevision!.id}/pins`)).json()
			).items as { jointId: number; pinId: number }[];
			if (items.length) {
				first = drawing;
				pin = items[0];
				break;
			}
		}
		if (!pin) throw new Error(`project ${projectId} has no drawing at revision 0 with pins`);
		// A turnover export of the project; 409 names the one already running.
		const started = await admin.post(`/api/projects/${projectId}/exports`, {
			headers: { origin: BASE_URL },
			data: { scope: { all: true } }
		});
		const exportId = ((await started.json()) as { id: number }).id;
		const lot = (await (await admin.get(`/api/projects/${projectId}/nde/lots?pageSize=1`)).json())
			.items[0];
		const wps = (await (await admin.get(`/api/projects/${projectId}/wps`)).json()) as {
			items: { id: number }[];
		};
		// An inspection record of the project, with a photo on it.
		const inspectionId = readDatabase(
			(db) =>
				(
					db
						.prepare(
							'select i.id from inspections i join joints j on j.id = i.joint_id where j.project_id = ? order by i.id limit 1'
						)
						.get(projectId) as { id: number }
				).id
		);
		const jpeg = await sharp({
			create: { width: 64, height: 48, channels: 3, background: '#888888' }
		})
			.jpeg()
			.toBuffer();
		// Photos are attached by inspectors, who work on both demo projects.
		const photo = await inspector.post(`/api/inspections/${inspectionId}/photos`, {
			headers: { origin: BASE_URL },
			multipart: { file: { name: 'matrix.jpg', mimeType: 'image/jpeg', buffer: jpeg } }
		});
		const photoId = ((await photo.json()) as { photo: { id: number } }).photo.id;
		ids[projectId] = {
			projectId: String(projectId),
			drawingId: String(first.id),
			revisionId: String(first.currentRevision!.id),
			jointId: String(pin.jointId),
			pinId: String(pin.pinId),
			exportId: String(exportId),
			lotId: String(lot.id),
			wpsId: String(wps.items[0].id),
			inspectionId: String(inspectionId),
			photoId: String(photoId),
			// The first tile of the first sheet (there or not yet, the rule is the PDF's).
			page: '0',
			level: '0',
			tile: '0_0.webp'
		};
	}
	await admin.dispose();
	await inspector.dispose();
	return ids;
}

for (const caller of callers) {
	test(`route matrix: ${caller.label}`, async () => {
		const ids = await demoIds();
		const client = caller.email
			? await signedInClient(caller.email)
			: await newRequest.newContext({ baseURL: BASE_URL });
		// Project 2 (VFT-3) is where the one non-member inspector should find nothing.
		for (const projectId of [1, 2]) {
			for (const e of endpoints) {
				const rule = ruleOf(e)!;
				// Public posts (sign-in, sign-out) are exercised by the sign-in tests instead.
				if (rule.access === 'public' && e.method !== 'GET') continue;
				if (projectId === 2 && rule.access !== 'project') continue;
				const want = expected(rule, caller.principal, projectId);
				const url = urlOf(e, ids[projectId]);
				const response = await ask(client, e, url);
				check(
					response.status(),
					response.headers()['location'],
					want,
					e.routeId.startsWith('/api/'),
					`${caller.label}: ${e.method} ${url} → ${want}`
				);
			}
		}
		await client.dispose();
	});
}
