/**
 * The `Idempotency-Key` of the request being answered, if it has one, carried through the
 * request's async calls. The database's `transaction` claims the key inside the first write
 * transaction that commits, so a stored record and its key are stored together or not at all.
 */
import { AsyncLocalStorage } from 'node:async_hooks';
import type Database from 'better-sqlite3';

export interface WriteClaim {
	userId: string;
	key: string;
	requestHash: string;
	method: string;
	path: string;
	/** Set once a transaction that claimed the key has committed. */
	claimed: boolean;
	/** Set while the claiming transaction runs: a transaction nested in it claims nothing. */
	claiming?: boolean;
}

export const writeClaims = new AsyncLocalStorage<WriteClaim>();

/**
 * Runs `run` (a transaction) with the claim of the current request's key inside it, when
 * there is one not yet claimed by an earlier transaction of the same request. A transaction
 * nested in the claiming one (a verb called inside another's transaction) claims nothing: the
 * outer one holds the claim, and commits or rolls back with it.
 */
export function withClaim<T>(client: Database.Database, run: (claim: () => void) => T): T {
	const claim = writeClaims.getStore();
	if (!claim || claim.claimed || claim.claiming) return run(() => {});
	claim.claiming = true;
	try {
		const result = run(() => {
			client
				.prepare(
					'INSERT INTO idempotency_keys (user_id, key, request_hash, method, path) VALUES (?, ?, ?, ?, ?)'
				)
				.run(claim.userId, claim.key, claim.requestHash, claim.method, claim.path);
		});
		claim.claimed = true;
		return result;
	} finally {
		claim.claiming = false;
	}
}
