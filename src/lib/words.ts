/**
 * Small word helpers every screen, e-mail and file uses, so counts and yes/no read the same
 * everywhere. Pure: no server, database or DOM.
 */

/**
 * "1 pin", "3 pins", "0 pins". `many` defaults to `one` + "s"; give it for other plurals
 * ("1 repair cycle", `plural(2, 'person', 'people')`). Counts over 9999 get thousands separators.
 */
export function plural(count: number, one: string, many = `${one}s`): string {
	return `${count.toLocaleString('en-US')} ${count === 1 ? one : many}`;
}

/** The word alone, for a count shown elsewhere: `noun(n, 'weld')` → "weld" / "welds". */
export function noun(count: number, one: string, many = `${one}s`): string {
	return count === 1 ? one : many;
}

/** The one yes/no convention of every file the app writes. */
export function yesNo(value: boolean): 'Yes' | 'No' {
	return value ? 'Yes' : 'No';
}

/** A database row as people name it: "Record 123", never "#123". */
export function recordLabel(id: number): string {
	return `Record ${id}`;
}

/** A file's size as people read it: "812 bytes", "45 KB", "3.2 MB" (1 KB = 1024 bytes). */
export function fileSize(bytes: number): string {
	if (bytes < 1024) return plural(bytes, 'byte');
	if (bytes < 1024 * 1024) return `${Math.max(1, Math.round(bytes / 1024))} KB`;
	const mb = bytes / 1024 / 1024;
	return `${mb < 10 ? mb.toFixed(1) : Math.round(mb)} MB`;
}

/** A criteria set as people name it: its name and edition, never its id. */
export function criteriaSetTitle(set: {
	name: string;
	edition: string;
	version?: number;
	basedOn?: unknown;
}): string {
	const edition = /edition/i.test(set.edition) ? set.edition : `${set.edition} edition`;
	const own = set.basedOn && set.version ? `, project version ${set.version}` : '';
	return `${set.name} (${edition}${own})`;
}
