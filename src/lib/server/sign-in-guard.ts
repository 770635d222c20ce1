/**
 * Slows and then refuses repeated failed sign-ins, per address and per client, in memory
 * (one process). After a few failures each attempt waits longer; after many, the address or
 * client is refused with 429 until the window has passed. A success clears the address.
 */
import * as audit from './audit';

const WINDOW_MS = 15 * 60_000;
const MAX_DELAY_MS = 4_000;
/** One address is guessed at by few; many people may sign in from one site's network. */
const SLOW_AFTER = { email: 3, client: 15 } as const;
const LOCK_AFTER = { email: 8, client: 40 } as const;

function delayFor(failures: number, slowAfter: number): number {
	return failures < slowAfter ? 0 : Math.min(MAX_DELAY_MS, 500 * 2 ** (failures - slowAfter));
}

interface Entry {
	failures: number;
	last: number;
}

const entries = new Map<string, Entry>();

export interface Attempt {
	email: string;
	client: string;
}

function keys(attempt: Attempt) {
	return {
		email: `email:${attempt.email.trim().toLowerCase()}`,
		client: `client:${attempt.client}`
	};
}

function live(key: string, now: number): Entry | undefined {
	const entry = entries.get(key);
	if (entry && now - entry.last > WINDOW_MS) {
		entries.delete(key);
		return undefined;
	}
	return entry;
}

export type GuardVerdict =
	{ allowed: true; delayMs: number } | { allowed: false; retryAfterS: number };

export function check(attempt: Attempt, now = Date.now()): GuardVerdict {
	const k = keys(attempt);
	const email = live(k.email, now);
	const client = live(k.client, now);
	for (const [entry, limit] of [
		[email, LOCK_AFTER.email],
		[client, LOCK_AFTER.client]
	] as const) {
		if (entry && entry.failures >= limit) {
			return { allowed: false, retryAfterS: Math.ceil((entry.last + WINDOW_MS - now) / 1000) };
		}
	}
	const delayMs = Math.max(
		delayFor(email?.failures ?? 0, SLOW_AFTER.email),
		delayFor(client?.failures ?? 0, SLOW_AFTER.client)
	);
	return { allowed: true, delayMs };
}

export function failed(attempt: Attempt, now = Date.now()): void {
	for (const key of Object.values(keys(attempt))) {
		const entry = live(key, now) ?? { failures: 0, last: now };
		entries.set(key, { failures: entry.failures + 1, last: now });
	}
	audit.record({
		action: 'sign_in_failed',
		entity: 'user',
		actorEmail: attempt.email.trim().toLowerCase().slice(0, 320),
		ip: attempt.client
	});
}

export const limits = { windowMs: WINDOW_MS, slowAfter: SLOW_AFTER, lockAfter: LOCK_AFTER };

export function succeeded(attempt: Attempt): void {
	entries.delete(keys(attempt).email);
}

export function refused(attempt: Attempt): void {
	audit.record({
		action: 'sign_in_refused',
		entity: 'user',
		actorEmail: attempt.email.trim().toLowerCase().slice(0, 320),
		ip: attempt.client
	});
}

/** For tests: forget every attempt and every link request. */
export function reset(): void {
	entries.clear();
	links.clear();
}

// Sign-in links ----------------------------------------------------------------------------

/** Each link is an e-mail sent in our name: a few per address, more per client (a site office). */
const LINKS_PER_WINDOW = { email: 3, client: 10 } as const;
const links = new Map<string, number[]>();

export const linkLimits = { windowMs: WINDOW_MS, ...LINKS_PER_WINDOW };

/**
 * Counts a request for a sign-in link and says whether one may be sent. Over the limit nothing
 * is sent, and the person is told the same as always (so the answer says nothing of accounts).
 */
export function linkRequested(attempt: Attempt, now = Date.now()): boolean {
	const k = keys(attempt);
	const recent = (key: string) => (links.get(key) ?? []).filter((at) => now - at < WINDOW_MS);
	const email = recent(k.email);
	const client = recent(k.client);
	const allowed = email.length < LINKS_PER_WINDOW.email && client.length < LINKS_PER_WINDOW.client;
	if (allowed) {
		email.push(now);
		client.push(now);
	} else {
		audit.record({
			action: 'sign_in_link_refused',
			entity: 'user',
			actorEmail: attempt.email.trim().toLowerCase().slice(0, 320),
			ip: attempt.client
		});
	}
	if (links.size > 10_000) links.clear();
	links.set(k.email, email);
	links.set(k.client, client);
	return allowed;
}

/**
 * The fields of a request to Auth.js, read exactly as Auth.js reads them (a JSON body, or a
 * URL-encoded form where a repeated field counts by its last value), so the guard counts the
 * address Auth.js will sign in, not another one sent beside it. Anything else has no fields.
 */
export async function authFields(request: Request): Promise<Record<string, unknown>> {
	const type = request.headers.get('content-type') ?? '';
	try {
		if (type.includes('application/json')) {
			const body: unknown = await request.clone().json();
			return body && typeof body === 'object' ? (body as Record<string, unknown>) : {};
		}
		if (type.includes('application/x-www-form-urlencoded'))
			return Object.fromEntries(new URLSearchParams(await request.clone().text()));
	} catch {
		// An unreadable body signs nobody in.
	}
	return {};
}

/** The address a field names, as Auth.js normalises it. */
export function addressOf(value: unknown): string {
	return typeof value === 'string' ? value.normalize('NFKC').trim().toLowerCase() : '';
}

export function pause(ms: number): Promise<void> {
	return ms > 0 ? new Promise((r) => setTimeout(r, ms)) : Promise.resolve();
}
