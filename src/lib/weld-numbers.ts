/**
 * Weld numbers as a person reads them: `5` < `5A` < `5B` < `6` < `10`, with any prefix
 * (`FW-3`) kept in front. Pure, shared by the server (sort column) and the client.
 */

const PARTS = /^(.*?)(\d+)([A-Z]*)$/i;

/** A second or later cut-out: `12N2` is the joint that replaced `12N`. */
const CUT_AGAIN = /^(.*\d[A-Z]*N)(\d+)$/i;

/** A text key that sorts weld numbers in reading order under plain string comparison. */
export function weldNumberSortKey(number: string): string {
	const again = CUT_AGAIN.exec(number.trim());
	if (again) return `${weldNumberSortKey(again[1])}${again[2].padStart(3, '0')}`;
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

/**
 * Letters for joints inserted between two numbers; R, M and N mean repair, modified and
 * cut-out (common practice in contractors' weld numbering procedures).
 */
export const INSERT_LETTERS = 'ABCDEFGHJKLPQSTUVWXYZ'.split('');

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

/** `12` → base `12`, cut 0; `12N` → `12`, 1; `12N3` → `12`, 3. */
const CUT_OUT = /^(.*\d[A-Z]*?)N(\d*)$/i;

/**
 * The number of the joint that replaces a cut-out: the original number with an N suffix
 * (`12` → `12N`), and for a cut-out of a replacement the next count (`12N` → `12N2`).
 * Never one already used on the drawing (common practice: numbers are never reused).
 */
export function cutOutWeldNumber(number: string, used: readonly string[]): string {
	const trimmed = number.trim();
	const taken = new Set(used.map((n) => n.trim().toUpperCase()));
	const match = CUT_OUT.exec(trimmed);
	const base = match ? match[1] : trimmed;
	let count = match ? (match[2] ? Number(match[2]) : 1) + 1 : 1;
	const candidate = () => (count === 1 ? `${base}N` : `${base}N${count}`);
	while (taken.has(candidate().toUpperCase())) count++;
	return candidate();
}

/**
 * The number to offer after one typed while placing: the same prefix, the next free number
 * (`FW-12` → `FW-13`; `101` → `102`). Null when the typed one has no digits to count on.
 */
export function followingWeldNumber(typed: string, used: readonly string[]): string | null {
	const match = PARTS.exec(typed.trim());
	if (!match) return null;
	return nextWeldNumber([...used, typed.trim()], match[1]);
}
