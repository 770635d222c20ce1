import { fail } from '@sveltejs/kit';
import * as criteriaSets from '$lib/server/criteria-sets';
import * as nde from '$lib/server/nde';
import { db } from '$lib/server/db';
import { clauseWords, codeExtent, CATEGORY_M, describeExtent, WELD_KINDS } from '$lib/nde/extent';
import { ndeSettingsSchema } from '$lib/schemas/nde';
import type { Actions, PageServerLoad } from './$types';

/** Each criteria set the project can use: the code's extent for it, and the project's own if set. */
function extentRows(projectId: number) {
	const rule = nde.projectRule(db, projectId);
	return criteriaSets.choices(projectId).map((choice) => {
		const chain = nde.chainOf(db, projectId, choice.id);
		const code = codeExtent(chain.at(-1));
		const inherited = chain.slice(1).find((id) => rule.extents[id]);
		return {
			id: choice.id,
			name: choice.name,
			builtIn: choice.builtIn,
			code: { words: code.words, clause: clauseWords(code), extent: describeExtent(code.extents) },
			own: rule.extents[choice.id] ?? null,
			inheritedFrom: inherited ?? null
		};
	});
}

export const load = (({ locals }) => {
	const projectId = locals.projectId!;
	return {
		title: 'NDE lots and extent',
		rule: nde.projectRule(db, projectId),
		sets: extentRows(projectId),
		categoryM: { words: CATEGORY_M.words, clause: clauseWords(CATEGORY_M) },
		caution: nde.NDE_CAUTION
	};
}) satisfies PageServerLoad;

export const actions = {
	default: async ({ request, locals }) => {
		const form = await request.formData();
		const text = (name: string) => String(form.get(name) ?? '').trim();
		const extents: Record<string, unknown[]> = {};
		for (let n = 0; form.has(`id:${n}`); n++) {
			if (form.get(`own:${n}`) !== 'on') continue;
			const percent = Number(text(`percent:${n}`) || '0');
			extents[text(`id:${n}`)] =
				percent > 0
					? [
							{
								method: text(`method:${n}`),
								percent,
								kinds: form
									.getAll(`kinds:${n}`)
									.map(String)
									.filter((k) => (WELD_KINDS as readonly string[]).includes(k))
							}
						]
					: [];
		}
		const input = {
			groupBy: text('groupBy'),
			everyWelder: form.get('everyWelder') === 'on',
			contractorEmail: text('contractorEmail'),
			extents
		};
		const parsed = ndeSettingsSchema.safeParse(input);
		if (!parsed.success) {
			const issue = parsed.error.issues[0];
			return fail(400, { error: issue.message, field: issue.path.join('.') });
		}
		const saved = nde.saveRule(locals.projectId!, parsed.data, locals.user!.id);
		return {
			ok: `Saved. Lots already formed keep their grouping and extent; ${saved.lotsTouched} lot${saved.lotsTouched === 1 ? '' : 's'} took welds not yet in a lot of the new extent.`
		};
	}
} satisfies Actions;
