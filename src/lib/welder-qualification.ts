/**
 * Welder qualification rules, pure: whether a welder may weld a process on a date (qualified,
 * not expired, continuity not lapsed) and the last day they may. The weld record checks
 * stamps with it, the welder register shows each process's "valid through" with it.
 */

/**
 * Six months without the process and the qualification lapses:
 * ASME BPVC Section IX QW-322.1(a) ("6 months or more" without welding in that process) and
 * AWS D1.1:2020 6.2.3.1 ("more than six months"; clause number unconfirmed, 4.1.3.1 in 2006).
 * Both run per process, from the last day the welder used it (or the test itself).
 */
export const CONTINUITY_MONTHS = 6;

function dateParts(date: string): [number, number, number] {
	const [y, m, d] = date.split('-').map(Number);
	return [y, m, d];
}

function isoOf(y: number, monthIndex: number, d: number): string {
	return new Date(Date.UTC(y, monthIndex, d)).toISOString().slice(0, 10);
}

/**
 * The same day of the month, `months` calendar months on; a day the month does not have
 * falls back to its last day (2026-08-31 + 6 → 2027-02-28).
 */
export function addCalendarMonths(date: string, months: number): string {
	const [y, m, d] = dateParts(date);
	const monthIndex = m - 1 + months;
	const lastDay = new Date(Date.UTC(y, monthIndex + 1, 0)).getUTCDate();
	return isoOf(y, monthIndex, Math.min(d, lastDay));
}

export function addDays(date: string, days: number): string {
	const [y, m, d] = dateParts(date);
	return isoOf(y, m - 1, d + days);
}

/**
 * The last day a welder may weld with a process, counted in calendar months from the last use:
 * last used 2026-03-15 → valid through 2026-09-15, lapsed from 2026-09-16. Exactly six months
 * on is still in: D1.1 says "more than six months". QW-322.1's "6 months or more" could be
 * read one day stricter; a contract that wants that reading sets the later use date.
 */
export function continuityValidThrough(lastUsedOn: string): string {
	return addCalendarMonths(lastUsedOn, CONTINUITY_MONTHS);
}

/** Continuity runs from the later of the test and the last use. */
export function continuityFrom(q: Pick<QualificationRecord, 'qualifiedOn' | 'lastUsedOn'>): string {
	return q.lastUsedOn && q.lastUsedOn > q.qualifiedOn ? q.lastUsedOn : q.qualifiedOn;
}

/**
 * The last day the welder may weld the process: the six-month continuity date counted from
 * the later of the test and the last use, or the record's own expiry if sooner.
 */
export function validThrough(
	q: Pick<QualificationRecord, 'qualifiedOn' | 'expiresOn' | 'lastUsedOn'>
): string {
	const continuity = continuityValidThrough(continuityFrom(q));
	return q.expiresOn && q.expiresOn < continuity ? q.expiresOn : continuity;
}

export interface QualificationRecord {
	process: string;
	qualifiedOn: string;
	expiresOn: string | null;
	lastUsedOn: string | null;
}

export type QualificationCheck =
	| { ok: true }
	| { ok: false; problem: 'not_qualified'; overridable: false }
	| { ok: false; problem: 'not_yet'; overridable: false; qualifiedOn: string }
	| { ok: false; problem: 'expired'; overridable: true; expiresOn: string }
	| {
			ok: false;
			problem: 'lapsed';
			overridable: true;
			lastUsedOn: string;
			validThrough: string;
			lapsedOn: string;
	  };

/**
 * May the welder weld this process on this date? `expiresOn` is the last day of validity
 * (the date written on the record); continuity runs from the later of the test and the last use.
 */
export function checkQualification(
	qualification: QualificationRecord | undefined,
	weldedOn: string
): QualificationCheck {
	if (!qualification) return { ok: false, problem: 'not_qualified', overridable: false };
	if (weldedOn < qualification.qualifiedOn) {
		return {
			ok: false,
			problem: 'not_yet',
			overridable: false,
			qualifiedOn: qualification.qualifiedOn
		};
	}
	if (qualification.expiresOn && weldedOn > qualification.expiresOn) {
		return { ok: false, problem: 'expired', overridable: true, expiresOn: qualification.expiresOn };
	}
	const lastUsedOn = continuityFrom(qualification);
	const validThrough = continuityValidThrough(lastUsedOn);
	if (weldedOn > validThrough) {
		return {
			ok: false,
			problem: 'lapsed',
			overridable: true,
			lastUsedOn,
			validThrough,
			lapsedOn: addDays(validThrough, 1)
		};
	}
	return { ok: true };
}
