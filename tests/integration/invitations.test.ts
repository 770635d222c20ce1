/**
 * An invitation as the invited person meets it: a link that lives long enough to be used
 * (`INVITE_HOURS`, 72 by default; a sign-in link asked for on the sign-in page keeps Auth.js's
 * 30 minutes), and a mail that names the project, the role and who invited.
 */
import { eq } from 'drizzle-orm';
import { beforeAll, describe, expect, it } from 'vitest';
import { db, schema } from '$lib/server/db';
import { config } from '$lib/server/config';
import * as users from '$lib/server/users';
import { signInLink } from '$lib/server/mail-templates';
import { makeProject, type MadeProject } from '../fixtures/projects';

let job: MadeProject;
const HOUR = 3_600_000;

beforeAll(async () => {
	job = await makeProject();
});

function tokensOf(email: string) {
	return db
		.select()
		.from(schema.verificationTokens)
		.where(eq(schema.verificationTokens.identifier, email))
		.all();
}

describe('an invitation', () => {
	it('lives 72 hours unless INVITE_HOURS says otherwise', () => {
		expect(process.env.INVITE_HOURS ?? '').toBe('');
		expect(config.inviteHours).toBe(72);
	});

	it("stretches the open link Auth.js stored to the invitation's lifetime, and no used or lapsed one", () => {
		const email = 'new.person@factory.test';
		users.invite(
			{ email, name: 'New Person', projectId: job.projectId, role: 'foreman' },
			job.users.admin
		);
		const at = Date.now();
		// As Auth.js stores them: the fresh link at 30 minutes, and one that lapsed yesterday.
		db.insert(schema.verificationTokens)
			.values([
				{ identifier: email, token: 'fresh', expires: new Date(at + 30 * 60_000) },
				{ identifier: email, token: 'lapsed', expires: new Date(at - 24 * HOUR) }
			])
			.run();
		expect(users.extendLinks(email, config.inviteHours, at)).toBe(1);
		const byToken = new Map(tokensOf(email).map((t) => [t.token, t.expires.getTime()]));
		expect(byToken.get('fresh')).toBe(at + 72 * HOUR);
		expect(byToken.get('lapsed')).toBe(at - 24 * HOUR);
	});

	it('names the project, the role and who invited, and how long the link works', () => {
		const email = 'second.person@factory.test';
		users.invite(
			{ email, name: 'Second Person', projectId: job.projectId, role: 'inspector' },
			job.users.admin
		);
		const facts = users.invitationFacts(email);
		const admin = users.byId(job.users.admin)!;
		expect(facts).toEqual({
			invitedBy: admin.name ?? admin.email,
			project: expect.stringContaining(job.code),
			role: 'Welding inspector'
		});
		const mail = signInLink(email, 'http://localhost/auth/x', 'invite', {
			minutes: config.inviteHours * 60,
			invitation: facts
		});
		expect(mail.subject).toContain(job.code);
		expect(mail.text).toContain(
			`${facts.invitedBy} has given you an account on Tacksheet on ${job.code}`
		);
		expect(mail.text).toContain('as Welding inspector');
		expect(mail.text).toContain('The link works once and for 72 hours.');
		// A sign-in link asked for on the sign-in page keeps its 30 minutes.
		expect(signInLink(email, 'http://localhost/auth/x', 'sign-in', { minutes: 30 }).text).toContain(
			'for 30 minutes'
		);
	});

	it('tells an invitation without a project plainly', () => {
		const email = 'third.person@factory.test';
		users.invite({ email, name: 'Third Person' }, job.users.admin);
		const facts = users.invitationFacts(email);
		expect(facts.project).toBeNull();
		const mail = signInLink(email, 'http://localhost/auth/x', 'invite', {
			minutes: 60,
			invitation: facts
		});
		expect(mail.subject).toBe('You are invited to Tacksheet');
		expect(mail.text).toContain('for 1 hour.');
	});
});
