import { feetInches, type Units } from './pipe-data';

/** Rolled sections in millimetres and kg/m; the imperial ones carry their designation in inches and lb/ft. */
export interface Section {
	name: string;
	d: number;
	bf: number;
	tf: number;
	tw: number;
	kgPerM: number;
	grade: string;
}

const inch = (v: number) => v * 25.4;
const lbft = (v: number) => v * 1.48816;

function wide(name: string, d: number, bf: number, tf: number, tw: number, w: number): Section {
	return {
		name,
		d: inch(d),
		bf: inch(bf),
		tf: inch(tf),
		tw: inch(tw),
		kgPerM: lbft(w),
		grade: 'A992'
	};
}

function euro(name: string, d: number, bf: number, tf: number, tw: number, kg: number): Section {
	return { name, d, bf, tf, tw, kgPerM: kg, grade: 'S355JR' };
}

/** Nominal dimensions of common AISC W shapes and EN 10365 HE/IPE sections, unconfirmed: good enough for invented drawings, not for design. */
export const SECTIONS: Record<Units, Section[]> = {
	imperial: [
		wide('W10x33', 9.73, 7.96, 0.435, 0.29, 33),
		wide('W12x26', 12.2, 6.49, 0.38, 0.23, 26),
		wide('W14x90', 14.0, 14.5, 0.71, 0.44, 90),
		wide('W16x40', 16.0, 7.0, 0.505, 0.305, 40),
		wide('W18x50', 18.0, 7.5, 0.57, 0.355, 50),
		wide('W21x62', 21.0, 8.24, 0.615, 0.4, 62),
		wide('W24x76', 23.9, 8.99, 0.68, 0.44, 76)
	],
	metric: [
		euro('HEA 200', 190, 200, 10, 6.5, 42.3),
		euro('HEA 300', 290, 300, 14, 8.5, 88.3),
		euro('HEB 300', 300, 300, 19, 11, 117),
		euro('IPE 300', 300, 150, 10.7, 7.1, 42.2),
		euro('IPE 400', 400, 180, 13.5, 8.6, 66.3),
		euro('HEA 400', 390, 300, 19, 11, 125)
	]
};

export interface Plate {
	/** Thickness in mm. */
	mm: number;
	label: string;
}

const fractions: [number, string][] = [
	[3 / 8, '3/8'],
	[1 / 2, '1/2'],
	[5 / 8, '5/8'],
	[3 / 4, '3/4'],
	[1, '1'],
	[1.25, '1-1/4'],
	[1.5, '1-1/2']
];

export function plate(units: Units, index: number): Plate {
	const i = Math.max(0, Math.min(6, index));
	if (units === 'imperial') return { mm: inch(fractions[i][0]), label: fractions[i][1] };
	const mm = [10, 12, 15, 20, 25, 30, 40][i];
	return { mm, label: String(mm) };
}

/** A plate thickness as a gauge reads it: 3/4" or 20 mm. */
export function plateText(p: Plate, units: Units): string {
	return units === 'imperial' ? `${p.label}"` : `${p.mm} mm`;
}

export function filletSizes(units: Units): { symbol: string; text: string }[] {
	return units === 'imperial'
		? [
				{ symbol: '1/4', text: '1/4"' },
				{ symbol: '5/16', text: '5/16"' },
				{ symbol: '3/8', text: '3/8"' }
			]
		: [
				{ symbol: '6', text: '6 mm' },
				{ symbol: '8', text: '8 mm' },
				{ symbol: '10', text: '10 mm' }
			];
}

export function flangeText(s: Section, units: Units): string {
	return units === 'imperial' ? `${(s.tf / 25.4).toFixed(3)}"` : `${s.tf} mm`;
}

export function steelLength(mm: number, units: Units): string {
	return units === 'imperial' ? feetInches(mm / 25.4) : `${Math.round(mm)}`;
}

export function weightText(kg: number, units: Units): string {
	return units === 'imperial'
		? `${Math.round(kg * 2.20462)} LB`
		: `${kg < 10 ? kg.toFixed(1) : Math.round(kg)} KG`;
}

export const STEEL_KG_PER_MM3 = 7.85e-6;

export interface ScaleChoice {
	ptPerMm: number;
	label: string;
}

const MM_TO_PT = 72 / 25.4;

/** The largest drafting scale at which `mm` fits in `available` points. */
export function chooseScale(units: Units, mm: number, available: number): ScaleChoice {
	const metric = [2, 2.5, 4, 5, 10, 15, 20, 25, 30, 40, 50, 75, 100];
	const imperial: [number, string][] = [
		[2, '6" = 1\'-0"'],
		[4, '3" = 1\'-0"'],
		[8, '1-1/2" = 1\'-0"'],
		[12, '1" = 1\'-0"'],
		[16, '3/4" = 1\'-0"'],
		[24, '1/2" = 1\'-0"'],
		[32, '3/8" = 1\'-0"'],
		[48, '1/4" = 1\'-0"'],
		[96, '1/8" = 1\'-0"']
	];
	const options: [number, string][] =
		units === 'imperial' ? imperial : metric.map((n) => [n, `1:${n}`]);
	for (const [n, label] of options)
		if ((mm * MM_TO_PT) / n <= available) return { ptPerMm: MM_TO_PT / n, label };
	const [n, label] = options[options.length - 1];
	return { ptPerMm: MM_TO_PT / n, label };
}
