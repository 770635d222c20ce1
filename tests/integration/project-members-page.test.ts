/**
 * The project members page's form actions (add, change a role, remove), posted as the browser
 * posts them, against a real SQLite file with a factory project. A row form that names no
 * member, or one that is gone, answers 400 or 404 and changes nothing.
 */
import { and, eq } from 'drizzle-orm';
import { beforeAll, describe, expect, it } from 'vitest';
import { db, schema } from '$lib/server/db';
import * as users from '$lib/server/users';
import { actions } from '../../src/routes/(app)/admin/projects/[projectId=id]/members/+page.server';
import { makeProject, type MadeProject } from '../fixtures/projects';

type Action = (event: never) => Promise<unknown>;
interface Sent {
	valid: boolean;
	errors: Record<string, string[] | undefined>;
	message?: { tone: string; text: string };
}

let projectId: number;
let members: MadeProject['users'];
/** An account that belongs to no project. */
let stranger: { id: string; email: string };

beforeAll(async () => {
	const job = await makeProject();
	projectId = job.projectId;
	members = job.users;
	stranger = users.invite({ email: 'stranger@factory.test', name: 'Stranger' }, members.admin);
});

async function post(action: keyof typeof actions, fields: Record<string, string>) {
	const body = new FormData();
	for (const [name, value] of Object.entries(fields)) body.set(name, value);
	const answer = (await (actions[action] as unknown as Action)({
		request: new Request(`http://localhost/admin/projects/${projectId}/members?/${action}`, {
			method: 'POST',
			body
		}),
		params: { projectId: String(projectId) },
		locals: { user: users.principal(members.admin) }
	} as never)) as { status?: number; data?: { form: Sent }; form?: Sent };
	return { status: answer.status ?? 200, form: (answer.data?.form ?? answer.form)! };
}

const roleOf = (userId: string) =>
	db
		.select({ role: schema.memberships.role })
		.from(schema.memberships)
		.where(and(eq(schema.memberships.projectId, projectId), eq(schema.memberships.userId, userId)))
		.get()?.role;
const roleChanges = () =>
	db.select().from(schema.auditEvents).where(eq(schema.auditEvents.action, 'role_change')).all()
		.length;

describe('changing a role', () => {
	it('stores the new role and says so in the role’s own words', async () => {
		const answer = await post('role', { userId: members.viewer, role: 'turnover' });
		expect(answer.status).toBe(200);
		expect(answer.form.message?.text).toMatch(/is now Turnover on TP-\d+\.$/);
		expect(roleOf(members.viewer)).toBe('turnover');
	});

	it('answers 400 with no member or an unknown role, and stores nothing', async () => {
		const changes = roleChanges();
		const noMember = await post('role', { role: 'viewer' });
		expect(noMember.status).toBe(400);
		expect(noMember.form.errors.userId?.[0]).toBe('Choose the member.');
		const badRole = await post('role', { userId: members.foreman, role: 'owner' });
		expect(badRole.status).toBe(400);
		expect(badRole.form.errors.role?.[0]).toBe('Choose one of the roles.');
		expect(roleOf(members.foreman)).toBe('foreman');
		expect(roleChanges()).toBe(changes);
	});

	it('answers 404 for an account that does not exist or is not a member, and stores nothing', async () => {
		const changes = roleChanges();
		const unknown = await post('role', { userId: 'no-such-account', role: 'viewer' });
		expect(unknown.status).toBe(404);
		expect(unknown.form.message).toMatchObject({ tone: 'error' });
		expect(unknown.form.message?.text).toMatch(/no such account/);
		const outsider = await post('role', { userId: stranger.id, role: 'inspector' });
		expect(outsider.status).toBe(404);
		expect(outsider.form.message?.text).toContain(`${stranger.email} is not a member`);
		expect(roleOf(stranger.id)).toBeUndefined();
		expect(roleChanges()).toBe(changes);
	});
});

describe('removing a member', () => {
	it('takes the member off the project, and answers 404 once they are gone', async () => {
		const removed = await post('remove', { userId: members.turnover });
		expect(removed.status).toBe(200);
		expect(roleOf(members.turnover)).toBeUndefined();
		const changes = roleChanges();
		const again = await post('remove', { userId: members.turnover });
		expect(again.status).toBe(404);
		const nobody = await post('remove', {});
		expect(nobody.status).toBe(400);
		expect(roleChanges()).toBe(changes);
	});
});

describe('adding a member', () => {
	it('adds an existing account in the role chosen, and answers 404 for an e-mail with none', async () => {
		const added = await post('add', { email: stranger.email, role: 'viewer' });
		expect(added.status).toBe(200);
		expect(roleOf(stranger.id)).toBe('viewer');
		const unknown = await post('add', { email: 'nobody@factory.test', role: 'viewer' });
		expect(unknown.status).toBe(404);
		expect(unknown.form.message?.text).toContain('has no account yet');
	});
});
