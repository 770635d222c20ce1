import { error, json, type Handle, type RequestEvent, type ServerInit } from '@sveltejs/kit';
import { sequence } from '@sveltejs/kit/hooks';
import { handle as authentication } from './auth';
import { getDb } from '$lib/server/db';
import { seedIfEmpty } from '$lib/server/demo/seed';
import * as mail from '$lib/server/mail';
import * as users from '$lib/server/users';
import * as guard from '$lib/server/sign-in-guard';
import * as exportJobs from '$lib/server/exports';
import * as nde from '$lib/server/nde';
import { ruleFor } from '$lib/server/route-access';
import { projectOf } from '$lib/server/route-project';
import { can, canGlobal, isMember } from '$lib/permissions';

/** Open and migrate the database, start the mail stand-in, and seed an empty database. */
export const init: ServerInit = async () => {
	const db = getDb();
	if (mail.usingStandIn()) await mail.startStandIn();
	// Exports a crash left running can never finish: say so before anyone waits on them.
	exportJobs.recoverInterrupted();
	// Turnover zips past EXPORT_KEEP_DAYS go now and every hour after; their records stay.
	exportJobs.startCleanup();
	const result = await seedIfEmpty(db);
	if (result.seeded) {
		console.log(
			`Tacksheet: first start, seeded ${result.users} users, ${result.projects} projects, ${result.drawings} drawings, ${result.joints} joints.`
		);
	}
	// NDE lots for welds recorded before lots were kept (or written around welds.record).
	nde.syncAll();
};

function clientOf(event: RequestEvent): string {
	try {
		return event.getClientAddress();
	} catch {
		return 'unknown';
	}
}

/**
 * Password sign-ins posted straight to Auth.js (scripts, integrators) pass the same guard
 * as the sign-in page: slowed after a few failures, then refused with 429.
 */
const guardCredentials: Handle = async ({ event, resolve }) => {
	if (event.request.method !== 'POST' || event.url.pathname !== '/auth/callback/credentials') {
		return resolve(event);
	}
	const form = await event.request
		.clone()
		.formData()
		.catch(() => null);
	const attempt = { email: String(form?.get('email') ?? ''), client: clientOf(event) };
	const verdict = guard.check(attempt);
	if (!verdict.allowed) {
		guard.refused(attempt);
		return json(
			{
				error: `Too many failed sign-ins. Try again in ${Math.ceil(verdict.retryAfterS / 60)} minutes.`
			},
			{ status: 429, headers: { 'retry-after': String(verdict.retryAfterS) } }
		);
	}
	await guard.pause(verdict.delayMs);
	const response = await resolve(event);
	const location = response.headers.get('location') ?? '';
	if (location.includes('error=')) guard.failed(attempt);
	else if (response.status < 400) guard.succeeded(attempt);
	return response;
};

const SESSION_COOKIES = ['__Secure-authjs.session-token', 'authjs.session-token'];
/** How long a decoded session cookie is trusted before Auth.js reads it again. */
const SESSION_CACHE_MS = 30_000;
const sessions = new Map<string, { userId: string | null; until: number }>();

/**
 * Who the session cookie belongs to. Decoding it through Auth.js costs a few milliseconds a
 * request, so the answer is kept for a short while per cookie value; the user row and roles
 * are still read on every request, so a role change or a disabled account applies at once.
 */
async function sessionUserId(event: RequestEvent): Promise<string | null> {
	const cookie = SESSION_COOKIES.map((name) => event.cookies.get(name)).find(Boolean);
	if (!cookie) {
		// A session too large for one cookie comes in numbered chunks: let Auth.js join them.
		const chunked = event.cookies
			.getAll()
			.some((c) => SESSION_COOKIES.some((name) => c.name.startsWith(`${name}.`)));
		if (!chunked) return null;
		const session = await event.locals.auth();
		return session?.user?.id ?? null;
	}
	const now = Date.now();
	const known = sessions.get(cookie);
	if (known && known.until > now) return known.userId;
	const session = await event.locals.auth();
	const userId = session?.user?.id ?? null;
	if (sessions.size > 5000) sessions.clear();
	sessions.set(cookie, { userId, until: now + SESSION_CACHE_MS });
	return userId;
}

async function identify(event: RequestEvent): Promise<App.Locals['user']> {
	const header = event.request.headers.get('authorization');
	if (header?.startsWith('Bearer ') && event.url.pathname.startsWith('/api/')) {
		return users.principalFromToken(header.slice(7).trim());
	}
	const userId = await sessionUserId(event);
	return userId ? users.principal(userId) : null;
}

/**
 * Every request is checked here against the route table, before any load, action or
 * endpoint runs: no route relies on a layout for protection.
 */
const authorize: Handle = async ({ event, resolve }) => {
	const api = event.url.pathname.startsWith('/api/');
	const deny = (status: 401 | 403 | 404 | 500, message: string) => {
		if (api) return json({ error: message }, { status });
		error(status, message);
	};

	event.locals.user = await identify(event);
	const user = event.locals.user;
	const routeId = event.route.id;
	if (!routeId) {
		if (api && !user && event.url.pathname !== '/api/health') return deny(401, 'Sign in first.');
		return resolve(event);
	}
	const rule = ruleFor(routeId, event.request.method, event.url.search);
	if (!rule) return deny(api ? 404 : 500, 'This request is not one Tacksheet answers.');
	if (rule.access === 'public') return resolve(event);

	if (!user) {
		if (api)
			return deny(401, 'Sign in first, or send a personal API token as "Authorization: Bearer …".');
		const back = event.url.pathname + event.url.search;
		return new Response(null, {
			status: 303,
			headers: { location: `/signin?returnTo=${encodeURIComponent(back)}` }
		});
	}
	if (rule.access === 'global' && !canGlobal(user, rule.action)) {
		return deny(403, 'Only an administrator may do this.');
	}
	if (rule.access === 'project') {
		const projectId = projectOf(event.params);
		if (projectId === null || !isMember(user, projectId))
			return deny(404, 'There is no such project, or you are not a member of it.');
		if (!can(user, rule.action, projectId))
			return deny(403, 'Your role on this project does not allow this.');
		event.locals.projectId = projectId;
	}
	return resolve(event);
};

export const handle: Handle = sequence(guardCredentials, authentication, authorize);
