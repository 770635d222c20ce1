/** People: accounts, their project roles, passwords and personal API tokens. */
import { DomainError } from './errors';
import crypto from 'node:crypto';
import { and, asc, count, eq, isNull, sql } from 'drizzle-orm';
import { db, schema, type Db } from './db';
import { config } from './config';
import { newPassword } from '$lib/schemas/account';
import * as audit from './audit';
import { hashPassword, verifyPassword } from './passwords';
import type { Principal, ProjectRole } from '$lib/permissions';

/** Verified against when the address is unknown, so both paths take the same time. */
let decoyHash: Promise<string> | undefined;

export function byEmail(email: string) {
	return db
		.select()
		.from(schema.users)
		.where(eq(schema.users.email, email.trim().toLowerCase()))
		.get();
}

export function byId(id: string) {
	return db.select().from(schema.users).where(eq(schema.users.id, id)).get();
}

export function canSignIn(email: string): boolean {
	const user = byEmail(email);
	return !!user && user.disabledAt == null;
}

export async function verifyCredentials(email: string, password: string) {
	const user = byEmail(email);
	if (!user || !user.passwordHash || user.disabledAt != null) {
		decoyHash ??= hashPassword(crypto.randomUUID());
		await verifyPassword(password, await decoyHash);
		return null;
	}
	return (await verifyPassword(password, user.passwordHash)) ? user : null;
}

export interface SignedInUser extends Principal {
	id: string;
	email: string;
	name: string | null;
	hasPassword: boolean;
	/** Set when the request came with a personal API token rather than a session. */
	tokenId?: number;
}

/** The caller as every request sees them: read fresh, so changes apply at once. */
export function principal(userId: string): SignedInUser | null {
	const user = byId(userId);
	if (!user || user.disabledAt != null) return null;
	const rows = db
		.select({ projectId: schema.memberships.projectId, role: schema.memberships.role })
		.from(schema.memberships)
		.where(eq(schema.memberships.userId, userId))
		.all();
	return {
		id: user.id,
		email: user.email,
		name: user.name,
		isAdmin: user.isAdmin,
		hasPassword: user.passwordHash != null,
		roles: Object.fromEntries(rows.map((r) => [r.projectId, r.role]))
	};
}

/**
 * The caller behind a session cookie: as `principal`, and only while the session's
 * generation is the user's current one (sign-out, a password change or reset and disabling
 * the account raise it). A cookie from before carries no generation and counts as 0.
 */
export function sessionPrincipal(userId: string, generation: number): SignedInUser | null {
	const user = byId(userId);
	if (!user || user.sessionGeneration !== generation) return null;
	return principal(userId);
}

export function sessionGeneration(userId: string): number {
	return byId(userId)?.sessionGeneration ?? 0;
}

type Tx = Parameters<Parameters<typeof db.transaction>[0]>[0];

/** Ends every session the user has now; the next sign-in starts a new generation. */
export function endSessions(userId: string, tx: Tx | typeof db = db): void {
	tx.update(schema.users)
		.set({ sessionGeneration: sql`${schema.users.sessionGeneration} + 1` })
		.where(eq(schema.users.id, userId))
		.run();
}

/** Revokes every live personal API token of the user; returns how many. */
function revokeAllTokens(userId: string, tx: Tx): number {
	return tx
		.update(schema.apiTokens)
		.set({ revokedAt: Date.now() })
		.where(and(eq(schema.apiTokens.userId, userId), isNull(schema.apiTokens.revokedAt)))
		.run().changes;
}

export function list() {
	const rows = db.select().from(schema.users).orderBy(asc(schema.users.email)).all();
	const memberships = db
		.select({
			userId: schema.memberships.userId,
			role: schema.memberships.role,
			projectId: schema.projects.id,
			projectCode: schema.projects.code
		})
		.from(schema.memberships)
		.innerJoin(schema.projects, eq(schema.projects.id, schema.memberships.projectId))
		.orderBy(asc(schema.projects.code))
		.all();
	return rows.map(({ passwordHash, ...user }) => ({
		...user,
		hasPassword: passwordHash != null,
		memberships: memberships.filter((m) => m.userId === user.id)
	}));
}

export function invite(
	input: { email: string; name: string; projectId?: number; role?: ProjectRole },
	actorId: string
) {
	if (byEmail(input.email)) throw new DomainError(`${input.email} already has an account.`, 409);
	return db.transaction((tx) => {
		const user = tx
			.insert(schema.users)
			.values({ email: input.email, name: input.name })
			.returning()
			.get();
		audit.record(
			{
				action: 'invite',
				entity: 'user',
				entityId: user.id,
				userId: actorId,
				after: { email: user.email, name: user.name }
			},
			tx
		);
		if (input.projectId && input.role) {
			tx.insert(schema.memberships)
				.values({ projectId: input.projectId, userId: user.id, role: input.role })
				.run();
			audit.record(
				{
					action: 'role_change',
					entity: 'membership',
					entityId: `${input.projectId}:${user.id}`,
					projectId: input.projectId,
					userId: actorId,
					before: null,
					after: { email: user.email, role: input.role }
				},
				tx
			);
		}
		return user;
	});
}

export function setDisabled(userId: string, disabled: boolean, actorId: string) {
	if (userId === actorId && disabled)
		throw new DomainError('You cannot disable your own account.', 409);
	const user = byId(userId);
	if (!user) throw new DomainError('There is no such user.', 404);
	db.transaction((tx) => {
		tx.update(schema.users)
			.set({ disabledAt: disabled ? Date.now() : null })
			.where(eq(schema.users.id, userId))
			.run();
		// Enabling again does not bring back what disabling ended: the person signs in anew.
		const tokensRevoked = disabled ? revokeAllTokens(userId, tx) : 0;
		if (disabled) endSessions(userId, tx);
		audit.record(
			{
				action: disabled ? 'disable' : 'enable',
				entity: 'user',
				entityId: userId,
				userId: actorId,
				before: { disabled: user.disabledAt != null },
				after: disabled ? { disabled, tokensRevoked } : { disabled }
			},
			tx
		);
	});
	return user;
}

/**
 * Clears the password; the person signs in with an e-mailed link and chooses a new one. A
 * reset is what is done for an account that may be in other hands, so it also ends every
 * session and revokes every personal API token.
 */
export function resetPassword(userId: string, actorId: string) {
	const user = byId(userId);
	if (!user) throw new DomainError('There is no such user.', 404);
	db.transaction((tx) => {
		tx.update(schema.users).set({ passwordHash: null }).where(eq(schema.users.id, userId)).run();
		endSessions(userId, tx);
		const tokensRevoked = revokeAllTokens(userId, tx);
		audit.record(
			{
				action: 'password_reset',
				entity: 'user',
				entityId: userId,
				userId: actorId,
				before: { hasPassword: user.passwordHash != null },
				after: { hasPassword: false, tokensRevoked }
			},
			tx
		);
	});
	return user;
}

export async function changePassword(userId: string, current: string, next: string) {
	const user = byId(userId);
	if (!user) throw new DomainError('There is no such user.', 404);
	if (user.passwordHash && !(await verifyPassword(current, user.passwordHash))) {
		throw new DomainError('Your current password is not right.', 400, 'current');
	}
	const passwordHash = await hashPassword(next);
	// Every session ends, this one too (the caller signs it in again); personal API tokens are
	// the person's own keys for scripts and stay until revoked.
	db.transaction((tx) => {
		tx.update(schema.users).set({ passwordHash }).where(eq(schema.users.id, userId)).run();
		endSessions(userId, tx);
		audit.record(
			{
				action: 'password_change',
				entity: 'user',
				entityId: userId,
				userId,
				before: { hasPassword: user.passwordHash != null },
				after: { hasPassword: true }
			},
			tx
		);
	});
}

export function members(projectId: number) {
	return db
		.select({
			userId: schema.users.id,
			email: schema.users.email,
			name: schema.users.name,
			role: schema.memberships.role,
			disabledAt: schema.users.disabledAt
		})
		.from(schema.memberships)
		.innerJoin(schema.users, eq(schema.users.id, schema.memberships.userId))
		.where(eq(schema.memberships.projectId, projectId))
		.orderBy(asc(schema.users.email))
		.all();
}

/** Add a member or change their role; `null` removes them from the project. */
export function setRole(
	projectId: number,
	userId: string,
	role: ProjectRole | null,
	actorId: string
) {
	const before = db
		.select({ role: schema.memberships.role })
		.from(schema.memberships)
		.where(and(eq(schema.memberships.projectId, projectId), eq(schema.memberships.userId, userId)))
		.get();
	db.transaction((tx) => {
		if (role === null) {
			tx.delete(schema.memberships)
				.where(
					and(eq(schema.memberships.projectId, projectId), eq(schema.memberships.userId, userId))
				)
				.run();
		} else {
			tx.insert(schema.memberships)
				.values({ projectId, userId, role })
				.onConflictDoUpdate({
					target: [schema.memberships.projectId, schema.memberships.userId],
					set: { role }
				})
				.run();
		}
		audit.record(
			{
				action: 'role_change',
				entity: 'membership',
				entityId: `${projectId}:${userId}`,
				projectId,
				userId: actorId,
				before: before ?? null,
				after: role ? { role } : null
			},
			tx
		);
	});
}

// Personal API tokens -------------------------------------------------------------------

const TOKEN_PREFIX = 'tks_';

function tokenHash(token: string): string {
	return crypto.createHash('sha256').update(token).digest('hex');
}

/** Returns the token text once; only its hash is kept. */
export function createToken(userId: string, name: string) {
	const token = `${TOKEN_PREFIX}${crypto.randomBytes(24).toString('base64url')}`;
	const row = db.transaction((tx) => {
		const created = tx
			.insert(schema.apiTokens)
			.values({ userId, name, tokenHash: tokenHash(token), prefix: token.slice(0, 10) })
			.returning({
				id: schema.apiTokens.id,
				name: schema.apiTokens.name,
				prefix: schema.apiTokens.prefix,
				createdAt: schema.apiTokens.createdAt
			})
			.get();
		audit.record(
			{
				action: 'token_create',
				entity: 'api_token',
				entityId: created.id,
				userId,
				after: { name, prefix: created.prefix }
			},
			tx
		);
		return created;
	});
	return { ...row, token };
}

export function tokens(userId: string) {
	return db
		.select({
			id: schema.apiTokens.id,
			name: schema.apiTokens.name,
			prefix: schema.apiTokens.prefix,
			createdAt: schema.apiTokens.createdAt,
			lastUsedAt: schema.apiTokens.lastUsedAt,
			revokedAt: schema.apiTokens.revokedAt
		})
		.from(schema.apiTokens)
		.where(eq(schema.apiTokens.userId, userId))
		.orderBy(asc(schema.apiTokens.createdAt))
		.all();
}

export function revokeToken(userId: string, tokenId: number) {
	const done = db.transaction((tx) => {
		const result = tx
			.update(schema.apiTokens)
			.set({ revokedAt: Date.now() })
			.where(
				and(
					eq(schema.apiTokens.id, tokenId),
					eq(schema.apiTokens.userId, userId),
					isNull(schema.apiTokens.revokedAt)
				)
			)
			.run();
		if (result.changes > 0)
			audit.record({ action: 'token_revoke', entity: 'api_token', entityId: tokenId, userId }, tx);
		return result.changes > 0;
	});
	if (!done) throw new DomainError('There is no such live token.', 404);
}

/** The user behind a bearer token, or null for an unknown or revoked one. */
export function principalFromToken(token: string): SignedInUser | null {
	if (!token.startsWith(TOKEN_PREFIX)) return null;
	const row = db
		.select({
			id: schema.apiTokens.id,
			userId: schema.apiTokens.userId,
			lastUsedAt: schema.apiTokens.lastUsedAt
		})
		.from(schema.apiTokens)
		.where(
			and(eq(schema.apiTokens.tokenHash, tokenHash(token)), isNull(schema.apiTokens.revokedAt))
		)
		.get();
	if (!row) return null;
	const user = principal(row.userId);
	if (!user) return null;
	// Last use to the minute is enough, and spares a write on every call.
	const now = Date.now();
	if (!row.lastUsedAt || now - row.lastUsedAt > 60_000) {
		db.update(schema.apiTokens)
			.set({ lastUsedAt: now })
			.where(eq(schema.apiTokens.id, row.id))
			.run();
	}
	return { ...user, tokenId: row.id };
}

/**
 * The first administrator of a production install (no demo job): from ADMIN_EMAIL and
 * ADMIN_PASSWORD, once, into an empty database. Returns whether it was created; an install
 * without them, or with a password the password rule refuses, does not start.
 */
export async function setUpFirstAdmin(into: Db = db): Promise<boolean> {
	const existing = into.select({ n: count() }).from(schema.users).get()?.n ?? 0;
	if (existing > 0) return false;
	if (!config.adminEmail || !config.adminPassword) {
		throw new Error(
			'TACKSHEET_DEMO=0 starts with an empty database: set ADMIN_EMAIL and ADMIN_PASSWORD for the first administrator.'
		);
	}
	const password = newPassword.safeParse(config.adminPassword);
	if (!password.success) {
		throw new Error(`ADMIN_PASSWORD: ${password.error.issues[0].message}`);
	}
	const user = into
		.insert(schema.users)
		.values({
			email: config.adminEmail.toLowerCase(),
			name: 'Administrator',
			isAdmin: true,
			passwordHash: await hashPassword(config.adminPassword)
		})
		.returning({ id: schema.users.id })
		.get();
	audit.record(
		{
			action: 'create',
			entity: 'user',
			entityId: user.id,
			after: { email: config.adminEmail, isAdmin: true }
		},
		into
	);
	return true;
}
