import { json } from '@sveltejs/kit';
import * as users from '$lib/server/users';
import { tokenCreateSchema } from '$lib/schemas/account';
import { readJson } from '$lib/server/api-body';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = ({ locals }) => json({ items: users.tokens(locals.user!.id) });

/** Create a token; its text is in this answer only. */
export const POST: RequestHandler = async ({ locals, request }) => {
	const read = await readJson(request);
	if ('response' in read) return read.response;
	const parsed = tokenCreateSchema.safeParse(read.body);
	if (!parsed.success) {
		return json(
			{ error: parsed.error.issues[0]?.message ?? 'Send { "name": "…" }.', field: 'name' },
			{ status: 400 }
		);
	}
	return json(users.createToken(locals.user!.id, parsed.data.name), { status: 201 });
};
