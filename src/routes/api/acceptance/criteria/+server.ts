import { json } from '@sveltejs/kit';
import { acceptanceNotice, checkIds, criteriaSets } from '$lib/acceptance';
import { checkDefinitions } from '$lib/acceptance/checks';
import type { RequestHandler } from './$types';

/** The built-in criteria sets, each limit with its clause, how sure we are of it, and where it applies. */
export const GET: RequestHandler = () => {
	const items = criteriaSets.map(({ limits, ...set }) => ({
		...set,
		limits: checkIds.flatMap((check) => {
			const limit = limits[check];
			if (!limit) return [];
			const { rule, clause, confidence, note, kinds, stages } = limit;
			return [
				{
					check,
					clause,
					confidence,
					note: note ?? null,
					kinds: kinds ?? checkDefinitions[check].kinds,
					stages: stages ?? checkDefinitions[check].stages,
					rule
				}
			];
		})
	}));
	return json({ items, notice: acceptanceNotice });
};
