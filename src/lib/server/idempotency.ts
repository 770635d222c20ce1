/**
 * `Idempotency-Key` on API writes. A client (the device's outbox above all) sends a key of its
 * own with each write; the server keeps the key per user with a hash of the request and the
 * answer it gave. The same key again gets that first answer (same ids, nothing stored twice),
 * also when both arrive together; the same key with another request is refused with 422.
 *
 * The key is claimed inside the write's own transaction (`db/write-claim.ts`), so a record and
 * its key are committed together: a retry after a crash finds the key and stores nothing again.
 */
import { createHash } from 'node:crypto';
import { json, type Handle } from '@sveltejs/kit';
import { and, eq, lt } from 'drizzle-orm';
import { getDb, schema } from './db';
import { writeClaims, type WriteClaim } from './db/write-claim';
import * as staged from './staged-uploads';

export const IDEMPOTENCY_HEADER = 'idempotency-key';
const WRITES = new Set(['POST', 'PUT', 'PATCH', 'DELETE']);
/** Visible ASCII, as a UUID or any other client-made token. */
const KEY_PATTERN = /^[\x21-\x7e]{1,200}$/;
/** Keys older than this are forgotten (a device that has been offline longer sends anew). */
export const KEEP_KEYS_MS = 30 * 24 * 3600 * 1000;
const SWEEP_EVERY_MS = 3600 * 1000;
/** Writes whose answer must not be kept: a new API token is shown once and never stored. */
const ANSWER_NOT_KEPT = new Set(['/api/tokens']);

/** Requests with the same user and key being answered now: a second one waits for the first. */
const inFlight = new Map<string, Promise<void>>();
let lastSweep = 0;

/**
 * The request's fingerprint: method, path and body. A multipart body is read as its fields and
 * files, so the same photo sent again with another boundary is the same request.
 */
export async function requestHash(request: Request, path: string): Promise<string> {
	const hash = createHash('sha256').update(`${request.method} ${path}\n`);
	const type = request.headers.get('content-type') ?? '';
	if (type.startsWith('multipart/form-data')) {
		try {
			const form = await request.clone().formData();
			for (const [name, value] of form) {
				hash.update(`${name}\0`);
				if (typeof value === 'string') hash.update(`s${value}\0`);
				else {
					hash.update(`f${value.type}\0`);
					hash.update(new Uint8Array(await value.arrayBuffer()));
					hash.update('\0');
				}
			}
			return hash.digest('hex');
		} catch {
			// Not a readable form: the raw bytes below, and the route answers it as it is.
		}
	}
	const bytes = new Uint8Array(await request.clone().arrayBuffer());
	// A file the upload stage streamed to disk arrives as a single-use token: its content counts.
	const file = type.startsWith('application/json') ? stagedFile(bytes) : undefined;
	hash.update(file ?? bytes);
	return hash.digest('hex');
}

function stagedFile(bytes: Uint8Array): string | undefined {
	try {
		const body = JSON.parse(new TextDecoder().decode(bytes)) as {
			staged?: unknown;
			fields?: unknown;
		};
		const file = staged.peek(body.staged);
		return file && `staged ${file.sha256} ${file.bytes} ${JSON.stringify(body.fields ?? {})}`;
	} catch {
		return undefined;
	}
}

function stored(userId: string, key: string) {
	return getDb()
		.select()
		.from(schema.idempotencyKeys)
		.where(and(eq(schema.idempotencyKeys.userId, userId), eq(schema.idempotencyKeys.key, key)))
		.get();
}

function keep(claim: WriteClaim, status: number, contentType: string | null, body: string) {
	const db = getDb();
	const answer = { status, contentType, body };
	db.insert(schema.idempotencyKeys)
		.values({
			userId: claim.userId,
			key: claim.key,
			requestHash: claim.requestHash,
			method: claim.method,
			path: claim.path,
			...answer
		})
		.onConflictDoUpdate({
			target: [schema.idempotencyKeys.userId, schema.idempotencyKeys.key],
			set: answer
		})
		.run();
	const now = Date.now();
	if (now - lastSweep > SWEEP_EVERY_MS) {
		lastSweep = now;
		db.delete(schema.idempotencyKeys)
			.where(lt(schema.idempotencyKeys.createdAt, now - KEEP_KEYS_MS))
			.run();
	}
}

function replay(row: typeof schema.idempotencyKeys.$inferSelect): Response {
	if (row.status === null)
		// Claimed with its write, but the server stopped before the answer was kept.
		return json(
			{
				error:
					'This write was stored, but its answer was lost when the server stopped. Reload to see the record.'
			},
			{ status: 409, headers: { 'idempotency-replayed': 'true' } }
		);
	return new Response(row.body ?? '', {
		status: row.status,
		headers: {
			...(row.contentType ? { 'content-type': row.contentType } : {}),
			'idempotency-replayed': 'true'
		}
	});
}

/** The hook: after `authorize`, for API writes of a signed-in user that carry a key. */
export const idempotentWrites: Handle = async ({ event, resolve }) => {
	const key = event.request.headers.get(IDEMPOTENCY_HEADER);
	const user = event.locals.user;
	if (
		key === null ||
		!user ||
		!WRITES.has(event.request.method) ||
		!event.url.pathname.startsWith('/api/') ||
		ANSWER_NOT_KEPT.has(event.route.id ?? '')
	)
		return resolve(event);
	if (!KEY_PATTERN.test(key))
		return json(
			{ error: 'Idempotency-Key must be 1 to 200 visible characters (a UUID, say).' },
			{ status: 400 }
		);
	const path = event.url.pathname + event.url.search;
	const hash = await requestHash(event.request, path);
	const id = `${user.id}\n${key}`;
	for (let waiting = inFlight.get(id); waiting; waiting = inFlight.get(id)) await waiting;

	const earlier = stored(user.id, key);
	if (earlier) {
		if (earlier.requestHash !== hash)
			return json(
				{
					error:
						'This Idempotency-Key was already used for a different request. Send a new key with a new write.'
				},
				{ status: 422 }
			);
		return replay(earlier);
	}

	let done = () => {};
	inFlight.set(id, new Promise<void>((settle) => (done = settle)));
	try {
		const claim: WriteClaim = {
			userId: user.id,
			key,
			requestHash: hash,
			method: event.request.method,
			path,
			claimed: false
		};
		const response = await writeClaims.run(claim, () => resolve(event));
		const contentType = response.headers.get('content-type');
		const textual = !contentType || /json|text/.test(contentType);
		// A server fault that changed nothing may be tried again with the same key.
		if (!textual || (response.status >= 500 && !claim.claimed)) return response;
		const body = await response.text();
		keep(claim, response.status, contentType, body);
		return new Response(response.status === 204 ? null : body, {
			status: response.status,
			statusText: response.statusText,
			headers: response.headers
		});
	} finally {
		inFlight.delete(id);
		done();
	}
};
