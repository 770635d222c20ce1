import { error, json, type Handle, type RequestEvent, type ServerInit } from '@sveltejs/kit';
import { sequence } from '@sveltejs/kit/hooks';
import { getToken } from '@auth/core/jwt';
import { handle as authentication, LINK_PURPOSE_HEADER, type SessionUser } from './auth';
import { getDb } from '$lib/server/db';
import { firstStart } from '$lib/server/first-start';
import * as mail from '$lib/server/mail';
import * as users from '$lib/server/users';
import * as guard from '$lib/server/sign-in-guard';
import * as exportJobs from '$lib/server/exports';
import * as nde from '$lib/server/nde';
import { allowedMethods, routeRule, ruleFor } from '$lib/server/route-access';
import { projectOf } from '$lib/server/route-project';
import { idempotentWrites } from '$lib/server/idempotency';
import { can, canGlobal, isMember } from '$lib/permissions';

/** Open and migrate the database, start the mail stand-in, and seed an empty database. */
export const init: ServerInit = async () => {
	const db = getDb();
	if (mail.usingStandIn()) await mail.startStandIn();
	// Exports a crash left running can never finish: say so before anyone waits on them, and
	// remove the zips they were writing.
	exportJobs.recoverInterrupted();
	await exportJobs.removeUnfinished();
	// Turnover zips past EXPORT_KEEP_DAYS go now and every hour after; their records stay.
	exportJobs.startCleanup();
	const result = await firstStart(db);
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
 * Headers every answer carries. Pages get their Content-Security-Policy from SvelteKit
 * (`kit.csp` in svelte.config.js, with a nonce for its inline script); anything else that
 * has none gets one that lets it run nothing and be framed nowhere.
 */
const SECURITY_HEADERS = {
	'x-content-type-options': 'nosniff',
	'referrer-policy': 'same-origin',
	'x-frame-options': 'DENY'
};
const HTML_WITHOUT_CSP =
	"default-src 'self'; style-src 'self' 'unsafe-inline'; object-src 'none'; base-uri 'self'; frame-ancestors 'none'";
const OTHER_CSP = "default-src 'none'; frame-ancestors 'none'";

const securityHeaders: Handle = async ({ event, resolve }) => {
	let response = await resolve(event);
	const headers: Record<string, string> = { ...SECURITY_HEADERS };
	if (!response.headers.has('content-security-policy')) {
		const type = response.headers.get('content-type') ?? '';
		// A PDF opened in the browser's own viewer must stay free to load what that viewer needs.
		headers['content-security-policy'] = type.startsWith('text/html')
			? HTML_WITHOUT_CSP
			: type.startsWith('application/pdf')
				? "frame-ancestors 'none'"
				: OTHER_CSP;
	}
	try {
		for (const [name, value] of Object.entries(headers)) response.headers.set(name, value);
	} catch {
		// Some answers (a redirect made by Response.redirect) have read-only headers: copy them.
		response = new Response(response.body, response);
		for (const [name, value] of Object.entries(headers)) response.headers.set(name, value);
	}
	return response;
};

/** adapter-node's limit on an ordinary request body (`BODY_SIZE_LIMIT`, default 512K). */
function bodySizeLimit(): number {
	const value = (process.env.BODY_SIZE_LIMIT || '512K').trim();
	const multiplier = { K: 1024, M: 1024 ** 2, G: 1024 ** 3 }[value.slice(-1).toUpperCase()];
	const bytes = Number(multiplier ? value.slice(0, -1) : value) * (multiplier ?? 1);
	return Number.isFinite(bytes) && bytes > 0 ? bytes : Infinity;
}

function refusal(event: RequestEvent, status: number, message: string, allow?: string) {
	const headers: Record<string, string> = allow ? { allow } : {};
	if (event.url.pathname.startsWith('/api/')) return json({ error: message }, { status, headers });
	return new Response(message, {
		status,
		headers: { ...headers, 'content-type': 'text/plain; charset=utf-8' }
	});
}

/**
 * Requests the route table already answers, before Auth.js or SvelteKit would throw on them:
 * a body over the size limit (413), an API path no route has (JSON 404), a method the route
 * does not take (405 with Allow), a form action the page does not have (404) or a missing or
 * badly encoded action name (400). The same answer with or without a session.
 */
const answerFromTable: Handle = async ({ event, resolve }) => {
	const { pathname } = event.url;
	const declared = Number(event.request.headers.get('content-length'));
	if (declared > bodySizeLimit())
		return refusal(
			event,
			413,
			`The request body is larger than the ${process.env.BODY_SIZE_LIMIT || '512K'} limit.`
		);
	const routeId = event.route.id;
	if (!routeId) {
		if (pathname.startsWith('/api/'))
			return refusal(event, 404, 'There is no such API address. The API is listed in the README.');
		if (pathname.startsWith('/auth/') && !['GET', 'HEAD', 'POST'].includes(event.request.method))
			return refusal(event, 405, `${event.request.method} is not taken here.`, 'GET, HEAD, POST');
		return resolve(event);
	}
	if (event.request.method === 'OPTIONS') {
		return new Response(null, {
			status: 204,
			headers: { allow: [...allowedMethods(routeId), 'OPTIONS'].join(', ') }
		});
	}
	const answer = routeRule(routeId, event.request.method, event.url.search);
	if (!answer.ok) return refusal(event, answer.status, answer.message, answer.allow);
	return resolve(event);
};

/**
 * Password sign-ins posted straight to Auth.js (scripts, integrators) pass the same guard
 * as the sign-in page: slowed after a few failures, then refused with 429. The address is
 * read the way Auth.js reads it, so a second `email` field or a JSON body counts the same.
 */
const guardCredentials: Handle = async ({ event, resolve }) => {
	if (event.request.method !== 'POST' || event.url.pathname !== '/auth/callback/credentials') {
		return resolve(event);
	}
	const fields = await guard.authFields(event.request);
	const attempt = { email: guard.addressOf(fields.email), client: clientOf(event) };
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

/**
 * Sign-in links asked of Auth.js directly are rationed like those asked on the sign-in page;
 * over the limit nothing is sent and the answer is the one Auth.js gives when it sends. Only
 * Tacksheet itself may say a link is an invitation or a reset.
 */
const guardLinks: Handle = async ({ event, resolve }) => {
	if (!event.url.pathname.startsWith('/auth/')) return resolve(event);
	if (event.request.headers.has(LINK_PURPOSE_HEADER))
		return refusal(event, 400, 'This header is not taken from outside.');
	if (event.request.method !== 'POST' || event.url.pathname !== '/auth/signin/nodemailer')
		return resolve(event);
	const fields = await guard.authFields(event.request);
	const attempt = { email: guard.addressOf(fields.email), client: clientOf(event) };
	if (guard.linkRequested(attempt)) return resolve(event);
	return new Response(null, {
		status: 302,
		headers: { location: `${event.url.origin}/signin/check-email?provider=nodemailer&type=email` }
	});
};

/**
 * Auth.js's own session endpoint (`GET /auth/session`) decodes the cookie by itself: it must
 * not vouch for a session that sign-out, a password change, a reset or a disable has ended.
 */
const endedSessions: Handle = async ({ event, resolve }) => {
	if (event.url.pathname !== '/auth/session') return resolve(event);
	const token = await getToken({
		req: event.request,
		secret: process.env.AUTH_SECRET,
		secureCookie: event.url.protocol === 'https:'
	});
	if (
		token?.sub &&
		!users.sessionPrincipal(token.sub, typeof token.gen === 'number' ? token.gen : 0)
	)
		return json(null, { headers: { 'cache-control': 'no-store' } });
	return resolve(event);
};

const SESSION_COOKIES = ['__Secure-authjs.session-token', 'authjs.session-token'];
/** How long a decoded session cookie is trusted before Auth.js reads it again. */
const SESSION_CACHE_MS = 30_000;
interface DecodedSession {
	userId: string;
	generation: number;
}
const sessions = new Map<string, { session: DecodedSession | null; until: number }>();

function decoded(session: { user?: SessionUser } | null): DecodedSession | null {
	const id = session?.user?.id;
	return id ? { userId: id, generation: session.user?.generation ?? 0 } : null;
}

/**
 * What the session cookie says: whose it is and its generation. Decoding it through Auth.js
 * costs a few milliseconds a request, so the answer is kept for a short while per cookie value
 * (it never changes for one value). Whether that generation is still the user's, the user row
 * and the roles are read on every request, so a sign-out, a role change or a disabled account
 * applies at once.
 */
async function sessionOf(event: RequestEvent): Promise<DecodedSession | null> {
	const cookie = SESSION_COOKIES.map((name) => event.cookies.get(name)).find(Boolean);
	if (!cookie) {
		// A session too large for one cookie comes in numbered chunks: let Auth.js join them.
		const chunked = event.cookies
			.getAll()
			.some((c) => SESSION_COOKIES.some((name) => c.name.startsWith(`${name}.`)));
		if (!chunked) return null;
		return decoded(await event.locals.auth());
	}
	const now = Date.now();
	const known = sessions.get(cookie);
	if (known && known.until > now) return known.session;
	const session = decoded(await event.locals.auth());
	if (sessions.size > 5000) sessions.clear();
	sessions.set(cookie, { session, until: now + SESSION_CACHE_MS });
	return session;
}

async function identify(event: RequestEvent): Promise<App.Locals['user']> {
	const header = event.request.headers.get('authorization');
	if (header?.startsWith('Bearer ') && event.url.pathname.startsWith('/api/')) {
		return users.principalFromToken(header.slice(7).trim());
	}
	const session = await sessionOf(event);
	if (!session) return null;
	const user = users.sessionPrincipal(session.userId, session.generation);
	// A session that has ended: the browser may as well forget its cookie.
	if (!user)
		for (const name of SESSION_COOKIES)
			if (event.cookies.get(name))
				event.cookies.delete(name, { path: '/', secure: name.startsWith('__Secure-') });
	return user;
}

/**
 * Every request is checked here against the route table, before any load, action or
 * endpoint runs: no route relies on a layout for protection.
 */
const authorize: Handle = async ({ event, resolve }) => {
	const api = event.url.pathname.startsWith('/api/');
	const deny = (status: 401 | 403 | 404, message: string) => {
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
	if (!rule) return deny(404, 'This request is not one Tacksheet answers.');
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

export const handle: Handle = sequence(
	securityHeaders,
	answerFromTable,
	guardCredentials,
	guardLinks,
	endedSessions,
	authentication,
	authorize,
	idempotentWrites
);
