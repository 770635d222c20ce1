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

/** For tests: forget every attempt. */
export function reset(): void {
	entries.clear();
}

export function pause(ms: number): Promise<void> {
	return ms > 0 ? new Promise((r) => setTimeout(r, ms)) : Promise.resolve();
}
