/**
 * Sign-in with Auth.js: e-mail and password, or a one-time link by e-mail. Sessions are JWT
 * cookies (HttpOnly, SameSite=Lax); who the user is and what they may do is read from the
 * database on every request (hooks.server.ts), so a role change or a disabled account takes
 * effect at once.
 */
import { SvelteKitAuth, type SvelteKitAuthConfig } from '@auth/sveltekit';
import Credentials from '@auth/sveltekit/providers/credentials';
import Nodemailer from '@auth/sveltekit/providers/nodemailer';
import { DrizzleAdapter } from '@auth/drizzle-adapter';
import { Auth, raw, skipCSRFCheck } from '@auth/core';
import { CredentialsSignin } from '@auth/core/errors';
import type { RequestEvent } from '@sveltejs/kit';
import { getDb, schema } from '$lib/server/db';
import * as users from '$lib/server/users';
import * as mail from '$lib/server/mail';
import * as audit from '$lib/server/audit';
import { signInLink, type LinkPurpose } from '$lib/server/mail-templates';
import { credentialsSchema } from '$lib/schemas/account';

const LINK_MINUTES = 30;

/** The session as the hooks read it: who, and under which session generation. */
export interface SessionUser {
	id?: string;
	generation?: number;
}
/** Set by Tacksheet itself when an administrator sends an invitation or a reset link. */
export const LINK_PURPOSE_HEADER = 'x-tacksheet-link-purpose';

async function authConfig(): Promise<SvelteKitAuthConfig> {
	return {
		// Must be set in code: the SvelteKit integration ignores AUTH_TRUST_HOST in a production build.
		trustHost: true,
		secret: process.env.AUTH_SECRET,
		basePath: '/auth',
		skipCSRFCheck,
		logger: {
			// A refused password is an answer, not a server fault; it goes to the audit trail instead.
			error(error) {
				if (error.name !== 'CredentialsSignin') console.error('[auth]', error);
			}
		},
		session: { strategy: 'jwt', maxAge: 12 * 60 * 60, updateAge: 60 * 60 },
		adapter: DrizzleAdapter(getDb(), {
			usersTable: schema.users,
			accountsTable: schema.accounts,
			sessionsTable: schema.sessions,
			verificationTokensTable: schema.verificationTokens
		}),
		pages: { signIn: '/signin', verifyRequest: '/signin/check-email', error: '/signin/problem' },
		providers: [
			Credentials({
				credentials: { email: { type: 'email' }, password: { type: 'password' } },
				async authorize(input) {
					const parsed = credentialsSchema.safeParse(input);
					if (!parsed.success) return null;
					const user = await users.verifyCredentials(parsed.data.email, parsed.data.password);
					return user ? { id: user.id, email: user.email, name: user.name } : null;
				}
			}),
			Nodemailer({
				server: await mail.transportOptions(),
				from: process.env.MAIL_FROM || 'Tacksheet <no-reply@tacksheet.test>',
				maxAge: LINK_MINUTES * 60,
				async sendVerificationRequest({ identifier, url, request }) {
					// Only live accounts get a link; the page says the same either way.
					if (!users.canSignIn(identifier)) return;
					const asked = request.headers.get(LINK_PURPOSE_HEADER);
					const purpose: LinkPurpose = asked === 'invite' || asked === 'reset' ? asked : 'sign-in';
					await mail.send(signInLink(identifier, url, purpose, LINK_MINUTES));
				}
			})
		],
		callbacks: {
			signIn({ user, account, email }) {
				if (account?.provider === 'nodemailer') {
					if (email?.verificationRequest) return true;
					return users.canSignIn(user.email ?? '');
				}
				return true;
			},
			jwt({ token, user }) {
				// The adapter hands over the whole user row; only the id goes into the token, with
				// the session generation it was signed in under (hooks.server.ts compares it).
				if (user?.id) {
					token.sub = user.id;
					token.gen = users.sessionGeneration(user.id);
				}
				return token;
			},
			session({ session, token }) {
				if (token.sub) session.user.id = token.sub;
				(session.user as SessionUser).generation = typeof token.gen === 'number' ? token.gen : 0;
				return session;
			}
		},
		events: {
			signOut(message) {
				const sub = 'token' in message ? message.token?.sub : undefined;
				if (!sub) return;
				// A JWT cannot be taken back: signing out ends every session of the user, here and
				// on any other device, by raising the generation each one is checked against.
				users.endSessions(sub);
				audit.record({ action: 'sign_out', entity: 'user', entityId: sub, userId: sub });
			},
			signIn({ user, account }) {
				audit.record({
					action: 'sign_in',
					entity: 'user',
					entityId: user.id,
					userId: user.id ?? null,
					actorEmail: user.email ?? null,
					after: { method: account?.provider === 'nodemailer' ? 'link' : 'password' }
				});
			}
		}
	};
}

export const { handle, signIn, signOut } = SvelteKitAuth(() => authConfig());

/** Run one Auth.js action from the server, as a browser form post would. */
async function authAction(
	origin: string,
	path: string,
	fields: Record<string, string>,
	headers: Headers = new Headers()
) {
	headers.set('content-type', 'application/x-www-form-urlencoded');
	const request = new Request(`${origin}/auth/${path}`, {
		method: 'POST',
		headers,
		body: new URLSearchParams(fields)
	});
	let result;
	try {
		result = await Auth(request, { ...(await authConfig()), raw });
	} catch (error) {
		// In raw mode Auth.js throws a refused password instead of redirecting with ?error=.
		if (error instanceof CredentialsSignin) return { ok: false, redirect: '', cookies: [] };
		throw error;
	}
	const redirect = result.redirect ?? '/';
	return { ok: !redirect.includes('error='), redirect, cookies: result.cookies ?? [] };
}

/** E-mail and password from our own sign-in page; true when the session cookie is set. */
export async function signInWithPassword(event: RequestEvent, email: string, password: string) {
	const result = await authAction(
		event.url.origin,
		'callback/credentials',
		{ email, password, callbackUrl: '/' },
		new Headers(event.request.headers)
	);
	for (const cookie of result.cookies) {
		event.cookies.set(cookie.name, cookie.value, { path: '/', ...cookie.options });
	}
	return result.ok;
}

/**
 * E-mail a one-time sign-in link: asked for on the sign-in page, or sent by an
 * administrator with an invitation or a password reset. Only a live account gets one.
 */
export async function sendSignInLink(
	origin: string,
	email: string,
	purpose: LinkPurpose,
	returnTo = '/projects'
): Promise<void> {
	const result = await authAction(
		origin,
		'signin/nodemailer',
		{ email, callbackUrl: `${origin}${returnTo.startsWith('/') ? returnTo : '/projects'}` },
		new Headers({ [LINK_PURPOSE_HEADER]: purpose })
	);
	if (!result.ok) throw new Error(`The sign-in link could not be sent (${result.redirect}).`);
}
