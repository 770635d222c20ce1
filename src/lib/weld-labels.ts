/**
 * Reads a weld number as it is printed on a drawing, under the project's numbering rule:
 * an optional shop or field prefix (`FW-12`, also written `FW12` or `FW 12`), one to four
 * digits without leading zeros kept (`007` reads as `7`), at most one insert letter (`5A`),
 * and a repair or cut-out suffix (`12R1`, `12-R1`, `12N`, `12N2`). The number comes back in
 * the project's own spelling of the prefix, so `fw12` on a sheet is `FW-12` in the register.
 * Pure: used by the server's sheet finder and by anything that checks a typed number.
 */
import { INSERT_LETTERS } from './weld-numbers';

export interface WeldLabelRule {
	shopPrefix: string;
	fieldPrefix: string;
}

export interface WeldLabel {
	number: string;
	/** Which prefix it carried; null when shop and field numbers look the same. */
	location: 'shop' | 'field' | null;
}

const LETTERS = INSERT_LETTERS.join('');
const BODY = new RegExp(`^[-_ ]?0*([1-9]\\d{0,3})([${LETTERS}])?(?:-?(R\\d{0,2}|N\\d{0,2}))?$`);

/** A prefix's letters and digits alone: `FW-` and `fw` are the same prefix. */
function core(prefix: string): string {
	return prefix.toUpperCase().replace(/[^A-Z0-9]/g, '');
}

export function readWeldLabel(text: string, rule: WeldLabelRule): WeldLabel | null {
	const compact = text.trim().toUpperCase().replace(/\s+/g, ' ');
	if (!compact || compact.length > 16) return null;
	const prefixes = [
		{ prefix: rule.fieldPrefix, location: 'field' as const },
		{ prefix: rule.shopPrefix, location: 'shop' as const }
	]
		// The longest prefix first, so `FW-` is tried before an empty shop prefix.
		.sort((a, b) => core(b.prefix).length - core(a.prefix).length);
	const same = core(rule.shopPrefix) === core(rule.fieldPrefix);
	for (const { prefix, location } of prefixes) {
		const c = core(prefix);
		if (!compact.startsWith(c)) continue;
		const rest = compact.slice(c.length);
		// A bare number has nothing in front; a prefixed one at most a separator.
		if (!c && /^[-_ ]/.test(rest)) continue;
		const match = BODY.exec(rest);
		if (!match) continue;
		const [, digits, letter = '', suffix = ''] = match;
		return {
			number: `${prefix}${digits}${letter}${suffix}`,
			location: same ? null : location
		};
	}
	return null;
}
