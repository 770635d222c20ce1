/**
 * Pipe sizes for the demo drawings: outside diameters and walls after ASME B36.10M (unconfirmed), enough to
 * print believable sizes and wall thicknesses on invented isometrics.
 */
export interface PipeSize {
	nps: string;
	dn: number;
	odIn: number;
	walls: Record<'SCH 10' | 'SCH 40' | 'SCH 80' | 'SCH 160', number>;
}

export const PIPE_SIZES: PipeSize[] = [
	{
		nps: '1/2',
		dn: 15,
		odIn: 0.84,
		walls: { 'SCH 10': 0.083, 'SCH 40': 0.109, 'SCH 80': 0.147, 'SCH 160': 0.188 }
	},
	{
		nps: '3/4',
		dn: 20,
		odIn: 1.05,
		walls: { 'SCH 10': 0.083, 'SCH 40': 0.113, 'SCH 80': 0.154, 'SCH 160': 0.219 }
	},
	{
		nps: '1',
		dn: 25,
		odIn: 1.315,
		walls: { 'SCH 10': 0.109, 'SCH 40': 0.133, 'SCH 80': 0.179, 'SCH 160': 0.25 }
	},
	{
		nps: '1-1/2',
		dn: 40,
		odIn: 1.9,
		walls: { 'SCH 10': 0.109, 'SCH 40': 0.145, 'SCH 80': 0.2, 'SCH 160': 0.281 }
	},
	{
		nps: '2',
		dn: 50,
		odIn: 2.375,
		walls: { 'SCH 10': 0.109, 'SCH 40': 0.154, 'SCH 80': 0.218, 'SCH 160': 0.344 }
	},
	{
		nps: '3',
		dn: 80,
		odIn: 3.5,
		walls: { 'SCH 10': 0.12, 'SCH 40': 0.216, 'SCH 80': 0.3, 'SCH 160': 0.438 }
	},
	{
		nps: '4',
		dn: 100,
		odIn: 4.5,
		walls: { 'SCH 10': 0.12, 'SCH 40': 0.237, 'SCH 80': 0.337, 'SCH 160': 0.531 }
	},
	{
		nps: '6',
		dn: 150,
		odIn: 6.625,
		walls: { 'SCH 10': 0.134, 'SCH 40': 0.28, 'SCH 80': 0.432, 'SCH 160': 0.719 }
	},
	{
		nps: '8',
		dn: 200,
		odIn: 8.625,
		walls: { 'SCH 10': 0.148, 'SCH 40': 0.322, 'SCH 80': 0.5, 'SCH 160': 0.906 }
	},
	{
		nps: '10',
		dn: 250,
		odIn: 10.75,
		walls: { 'SCH 10': 0.165, 'SCH 40': 0.365, 'SCH 80': 0.594, 'SCH 160': 1.125 }
	},
	{
		nps: '12',
		dn: 300,
		odIn: 12.75,
		walls: { 'SCH 10': 0.18, 'SCH 40': 0.406, 'SCH 80': 0.688, 'SCH 160': 1.312 }
	},
	{
		nps: '14',
		dn: 350,
		odIn: 14,
		walls: { 'SCH 10': 0.25, 'SCH 40': 0.438, 'SCH 80': 0.75, 'SCH 160': 1.406 }
	},
	{
		nps: '16',
		dn: 400,
		odIn: 16,
		walls: { 'SCH 10': 0.25, 'SCH 40': 0.5, 'SCH 80': 0.844, 'SCH 160': 1.594 }
	},
	{
		nps: '18',
		dn: 450,
		odIn: 18,
		walls: { 'SCH 10': 0.25, 'SCH 40': 0.562, 'SCH 80': 0.938, 'SCH 160': 1.781 }
	},
	{
		nps: '20',
		dn: 500,
		odIn: 20,
		walls: { 'SCH 10': 0.25, 'SCH 40': 0.594, 'SCH 80': 1.031, 'SCH 160': 1.969 }
	},
	{
		nps: '24',
		dn: 600,
		odIn: 24,
		walls: { 'SCH 10': 0.25, 'SCH 40': 0.688, 'SCH 80': 1.219, 'SCH 160': 2.344 }
	}
];

export type ScheduleName = keyof PipeSize['walls'];
const SCHEDULES: ScheduleName[] = ['SCH 10', 'SCH 40', 'SCH 80', 'SCH 160'];

export function findPipeSize(text: string): PipeSize {
	const s = text
		.trim()
		.toUpperCase()
		.replace(/["\s]|NPS/g, '');
	const dn = /^DN(\d+)$/.exec(s);
	if (dn) return PIPE_SIZES.find((p) => p.dn === Number(dn[1])) ?? nearestByDn(Number(dn[1]));
	const exact = PIPE_SIZES.find((p) => p.nps === s || p.nps.replace('-', ' ') === s);
	if (exact) return exact;
	const n = Number(s);
	return Number.isFinite(n) ? nearestByDn(n * 25) : PIPE_SIZES[7];
}

function nearestByDn(dn: number): PipeSize {
	return PIPE_SIZES.reduce((best, p) => (Math.abs(p.dn - dn) < Math.abs(best.dn - dn) ? p : best));
}

export function smallerSize(size: PipeSize, steps: number): PipeSize {
	const i = PIPE_SIZES.indexOf(size);
	return PIPE_SIZES[Math.max(0, i - steps)];
}

/** The schedule a line's wall belongs to, so a reduced size downstream gets the same schedule. */
export function scheduleOf(size: PipeSize, schedule: string): ScheduleName {
	const s = schedule.trim().toUpperCase();
	const named = SCHEDULES.find((n) => s === n || s === n.replace(' ', ''));
	if (named) return named;
	if (s === 'STD') return 'SCH 40';
	if (s === 'XS') return 'SCH 80';
	const mm = /([\d.]+)\s*MM/.exec(s);
	const inch = /([\d.]+)\s*(IN|")/.exec(s);
	const wallIn = mm ? Number(mm[1]) / 25.4 : inch ? Number(inch[1]) : NaN;
	if (!Number.isFinite(wallIn)) return 'SCH 40';
	return SCHEDULES.reduce((best, n) =>
		Math.abs(size.walls[n] - wallIn) < Math.abs(size.walls[best] - wallIn) ? n : best
	);
}

export type Units = 'imperial' | 'metric';

export function sizeLabel(size: PipeSize, units: Units): string {
	return units === 'imperial' ? `${size.nps}"` : `DN${size.dn}`;
}

export function wallLabel(size: PipeSize, schedule: ScheduleName, units: Units): string {
	const w = size.walls[schedule];
	return units === 'imperial' ? `${w.toFixed(3)}"` : `${(w * 25.4).toFixed(1)} mm`;
}

export function scheduleLabel(size: PipeSize, schedule: ScheduleName, units: Units): string {
	return units === 'imperial' ? schedule : `${(size.walls[schedule] * 25.4).toFixed(2)} mm`;
}

/** Feet and inches to the nearest 1/16", as a fitter reads a tape. */
export function feetInches(inches: number): string {
	const sixteenths = Math.round(inches * 16);
	const feet = Math.floor(sixteenths / (12 * 16));
	const rest = sixteenths - feet * 12 * 16;
	const whole = Math.floor(rest / 16);
	let frac = rest % 16;
	let den = 16;
	while (frac > 0 && frac % 2 === 0) {
		frac /= 2;
		den /= 2;
	}
	const fracText = frac ? ` ${frac}/${den}` : '';
	return feet > 0 ? `${feet}'-${whole}${fracText}"` : `${whole}${fracText}"`;
}

export function lengthLabel(mm: number, units: Units): string {
	return units === 'imperial' ? feetInches(mm / 25.4) : `${Math.round(mm)}`;
}

export interface MaterialFamily {
	fitting: string;
	flange: string;
	bolting: string;
	gasket: string;
}

export function materialFamily(pipeMaterial: string): MaterialFamily {
	const m = pipeMaterial.toUpperCase();
	if (/316|304|A312|1\.44|1\.43/.test(m))
		return {
			fitting: /316/.test(m) || /1\.44/.test(m) ? 'A403 WP316L' : 'A403 WP304L',
			flange: /316/.test(m) || /1\.44/.test(m) ? 'A182 F316L' : 'A182 F304L',
			bolting: 'A193 B8M CL2 / A194 8M',
			gasket: 'SPW 316/GRAPH, 316 IR'
		};
	if (/A333|LTCS|LF2/.test(m))
		return {
			fitting: 'A420 WPL6',
			flange: 'A350 LF2 CL1',
			bolting: 'A320 L7 / A194 7',
			gasket: 'SPW 316/GRAPH, CS CR'
		};
	if (/P2[36]5GH|P355|EN 10216/.test(m))
		return {
			fitting: 'EN 10253-2 P265GH',
			flange: 'EN 1092-1 P250GH',
			bolting: '25CrMo4 / C35E',
			gasket: 'SPW 1.4404/GRAPH'
		};
	return {
		fitting: 'A234 WPB',
		flange: 'A105N',
		bolting: 'A193 B7 / A194 2H',
		gasket: 'SPW 316/GRAPH, CS CR'
	};
}
