/**
 * Weld numbers as a person reads them: `5` < `5A` < `5B` < `6` < `10`, with any prefix
 * (`FW-3`) kept in front. Pure, shared by the server (sort column) and the client.
 */

const PARTS = /^(.*?)(\d+)([A-Z]*)$/i;

/** A text key that sorts weld numbers in reading order under plain string comparison. */
export function weldNumberSortKey(number: string): string {
	const match = PARTS.exec(number.trim());
	if (!match) return number.trim().toUpperCase();
	const [, prefix, digits, suffix] = match;
	return `${prefix.toUpperCase()}${digits.padStart(8, '0')}${suffix.toUpperCase()}`;
}

/** The number after the highest one used so far (voided numbers count: never reused). */
export function nextWeldNumber(used: readonly string[], prefix = ''): string {
	let highest = 0;
	for (const number of used) {
		const match = PARTS.exec(number.trim());
		if (match && match[1].toUpperCase() === prefix.toUpperCase()) {
			highest = Math.max(highest, Number(match[2]));
		}
	}
	return `${prefix}${highest + 1}`;
}

/** Letters for joints inserted between two numbers; R and M mean repair and modified. */
const INSERT_LETTERS = 'ABCDEFGHJKLNPQSTUVWXYZ'.split('');

/**
 * The number for a joint inserted after `after`: `5` → `5A`, then `5B` … so existing numbers
 * never move. Null when every letter is taken.
 */
export function insertedWeldNumber(after: string, used: readonly string[]): string | null {
	const base = after.trim().replace(/[A-Z]+$/i, '');
	const taken = new Set(used.map((n) => n.trim().toUpperCase()));
	for (const letter of INSERT_LETTERS) {
		const candidate = `${base}${letter}`;
		if (!taken.has(candidate.toUpperCase())) return candidate;
	}
	return null;
}
