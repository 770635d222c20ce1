import { error, json, type Handle, type RequestEvent, type ServerInit } from '@sveltejs/kit';
import { sequence } from '@sveltejs/kit/hooks';
import { handle as authentication } from './auth';
import { getDb } from '$lib/server/db';
import { seedIfEmpty } from '$lib/server/demo/seed';
import * as mail from '$lib/server/mail';
import * as users from '$lib/server/users';
import * as guard from '$lib/server/sign-in-guard';
import * as exportJobs from '$lib/server/exports';
import { ruleFor } from '$lib/server/route-access';
import { projectOf } from '$lib/server/route-project';
import { can, canGlobal, isMember } from '$lib/permissions';

/** Open and migrate the database, start the mail stand-in, and seed an empty database. */
export const init: ServerInit = async () => {
	const db = getDb();
	if (mail.usingStandIn()) await mail.startStandIn();
	// Exports a crash left running can never finish: say so before anyone waits on them.
	exportJobs.recoverInterrupted();
	const result = await seedIfEmpty(db);
	if (result.seeded) {
		console.log(
			`Tacksheet: first start, seeded ${result.users} users, ${result.projects} projects, ${result.drawings} drawings, ${result.joints} joints.`
		);
	}
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

async function identify(event: RequestEvent): Promise<App.Locals['user']> {
	const header = event.request.headers.get('authorization');
	if (header?.startsWith('Bearer ') && event.url.pathname.startsWith('/api/')) {
		return users.principalFromToken(header.slice(7).trim());
	}
	const session = await event.locals.auth();
	return session?.user?.id ? users.principal(session.user.id) : null;
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
