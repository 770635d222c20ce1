/**
 * Welding processes as WPSs and qualification records name them: the AWS A3.0 / ASME IX
 * letters, or an ISO 4063 reference number read as those letters. Pure.
 */

/**
 * ISO 4063 reference numbers, as metric WPSs name processes, to the AWS A3.0 / ASME IX letters
 * the qualification records use. Unconfirmed; 138 (metal-cored wire) counts as GMAW in both
 * codes' process lists.
 */
export const ISO_4063: Readonly<Record<string, string>> = {
	'111': 'SMAW',
	'114': 'FCAW',
	'121': 'SAW',
	'131': 'GMAW',
	'135': 'GMAW',
	'136': 'FCAW',
	'138': 'GMAW',
	'141': 'GTAW',
	'15': 'PAW'
};

/** Arc and gas processes as AWS A3.0 names them; a suffix (`FCAW-G`) is kept as written. */
export const PROCESS_LETTERS = ['SMAW', 'GTAW', 'GMAW', 'FCAW', 'SAW', 'PAW', 'ESW', 'EGW', 'OFW'];

/** The letters of a process as typed (`gtaw`, `141`, `FCAW-G`), or null when unreadable. */
export function normalProcess(part: string): string | null {
	const name = part.trim().toUpperCase();
	if (ISO_4063[name]) return ISO_4063[name];
	return /^[A-Z]{2,5}(-[A-Z0-9]{1,3})?$/.test(name) ? name : null;
}

/** A process the codes list (letters or ISO 4063 number), not just letters that look like one. */
export function isKnownProcess(part: string): boolean {
	const name = part.trim().toUpperCase();
	return name in ISO_4063 || PROCESS_LETTERS.includes(name.split('-')[0]);
}

/** Whether a WPS listing `listed` covers `used`: `FCAW` covers `FCAW-G`, not the other way. */
export function processCovered(listed: readonly string[], used: string): boolean {
	const name = normalProcess(used);
	if (!name) return false;
	return listed.some((entry) => entry === name || entry === name.split('-')[0]);
}
