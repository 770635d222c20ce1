/**
 * The caution that travels with every verdict: on each screen that shows one, in each file
 * that carries one (weld-log CSV and workbook, inspections.csv, the turnover cover and
 * manifest) and in each API answer (`notice`). Defined here once; nothing else words it.
 */

/** The first sentence, set in bold on screens. */
export const CAUTION_LEAD = 'Verdicts are an aid.';

/** The rest of the caution. */
export const CAUTION_REST =
	'Acceptance rests with a qualified inspector under the code, edition and contract in force.';

/** The whole caution as one line: the `notice` of API answers and files. */
export const CAUTION = `${CAUTION_LEAD} ${CAUTION_REST}`;

/**
 * The first line of every CSV file that carries verdicts: one cell, so a spreadsheet shows
 * it above the header row and a program skips one line (`skiprows=1`).
 */
export const CSV_CAUTION_CELL = `Notice: ${CAUTION}`;
