/**
 * Nominal pipe sizes and their outside diameters, from ASME B36.10M (welded and seamless
 * wrought steel pipe), Table 1, where the OD is given in inches; DN is the metric
 * designation of the same size in that table. Pure: the joint card and the seed use it.
 */

const OUTSIDE_DIAMETER_IN: Record<string, number> = {
	'1/2': 0.84,
	'3/4': 1.05,
	'1': 1.315,
	'1-1/4': 1.66,
	'1-1/2': 1.9,
	'2': 2.375,
	'2-1/2': 2.875,
	'3': 3.5,
	'4': 4.5,
	'6': 6.625,
	'8': 8.625,
	'10': 10.75,
	'12': 12.75,
	'14': 14,
	'16': 16,
	'18': 18,
	'20': 20,
	'24': 24
};

const DN_TO_NPS: Record<number, string> = {
	15: '1/2',
	20: '3/4',
	25: '1',
	32: '1-1/4',
	40: '1-1/2',
	50: '2',
	65: '2-1/2',
	80: '3',
	100: '4',
	150: '6',
	200: '8',
	250: '10',
	300: '12',
	350: '14',
	400: '16',
	450: '18',
	500: '20',
	600: '24'
};

export const NOMINAL_PIPE_SIZES = Object.keys(OUTSIDE_DIAMETER_IN);

/**
 * Outside diameter in mm for `6`, `NPS 6`, `6"`, `1-1/2 in` or `DN150`; null when the text
 * is not a nominal size in the table.
 */
export function outsideDiameterMm(size: string): number | null {
	const text = size.trim().toUpperCase();
	const dn = /^DN\s*(\d+)$/.exec(text);
	const nps = dn
		? DN_TO_NPS[Number(dn[1])]
		: text
				.replace(/^NPS\s*/, '')
				.replace(/\s*(IN|INCH|")$/, '')
				.replace(/^(\d+)\s+(\d\/\d)$/, '$1-$2');
	const inches = nps ? OUTSIDE_DIAMETER_IN[nps] : undefined;
	return inches === undefined ? null : Math.round(inches * 25.4 * 10) / 10;
}
