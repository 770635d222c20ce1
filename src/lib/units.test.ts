import { describe, expect, it } from 'vitest';
import { quantitySpec } from './acceptance/readings';
import {
	formatAngle,
	formatBoth,
	formatLength,
	MM_PER_INCH,
	parseAngle,
	parseLength
} from './units';

const imperial = { units: 'imperial' } as const;
const metric = { units: 'metric' } as const;

function mm(text: string | number, options: Parameters<typeof parseLength>[1] = imperial): number {
	const parsed = parseLength(text, options);
	if (!parsed.ok) throw new Error(parsed.message);
	return parsed.value;
}

function refusal(result: ReturnType<typeof parseLength>): string {
	if (result.ok) throw new Error(`expected a refusal, got ${result.value}`);
	return result.message;
}

describe('parseLength', () => {
	// 1 in = 25.4 mm exactly (international inch, 1959).
	it('takes 1 in as exactly 25.4 mm', () => {
		expect(MM_PER_INCH).toBe(25.4);
		expect(mm('1 in')).toBe(25.4);
		expect(mm('1"')).toBe(25.4);
	});

	it.each([
		['3/8', 9.525],
		['3/8"', 9.525],
		['3/8 in', 9.525],
		['3/8in', 9.525],
		['3/8 in.', 9.525],
		['3/8 inch', 9.525],
		["3/8''", 9.525],
		['3⁄8″', 9.525],
		['.375in', 9.525],
		['0.375', 9.525],
		['1-1/4 in', 31.75],
		['1 1/4"', 31.75],
		['1-1/4"', 31.75],
		['1½ in', 38.1],
		['½"', 12.7],
		['2 inches', 50.8],
		['9.5 mm', 9.5],
		['9,5 mm', 9.5],
		['9.5mm', 9.5],
		['1/32', 0.79375],
		['1/64', 0.396875],
		['  3/16  ', 4.7625]
	])('reads %s in an imperial project as %f mm', (text, expected) => {
		expect(mm(text)).toBeCloseTo(expected, 9);
	});

	it('reads a bare number in a metric project as millimetres', () => {
		expect(mm('9.5', metric)).toBe(9.5);
		expect(mm('9,5', metric)).toBe(9.5);
		expect(mm('3/8 in', metric)).toBeCloseTo(9.525, 9);
	});

	it('refuses a bare fraction in a metric project as ambiguous', () => {
		expect(refusal(parseLength('3/8', metric))).toMatch(/no unit/);
		expect(
			refusal(parseLength('1-1/4', { units: 'metric', reading: quantitySpec('rootOpening') }))
		).toMatch(/^Root opening:/);
	});

	it('keeps the text as typed and the unit it was read in', () => {
		const typed = parseLength(' 3/8 ', imperial);
		expect(typed).toMatchObject({ ok: true, text: '3/8', unit: 'in' });
		expect(typed.ok && typed.value).toBeCloseTo(9.525, 9);
		expect(parseLength('9.5 mm', imperial)).toEqual({
			ok: true,
			value: 9.5,
			text: '9.5 mm',
			unit: 'mm'
		});
		expect(parseLength('9.5', metric)).toEqual({ ok: true, value: 9.5, text: '9.5', unit: 'mm' });
	});

	it('takes a number as millimetres already, as the JSON API sends it', () => {
		expect(parseLength(0.79375, imperial)).toEqual({
			ok: true,
			value: 0.79375,
			text: '0.79375',
			unit: 'mm'
		});
	});

	it.each(['abc', '3/0', '1-5/4', '3 ft', '3/8 cm', '1..5', 'in', '3/8/2', '1e3'])(
		'refuses %s as unreadable',
		(text) => {
			expect(
				refusal(parseLength(text, { units: 'imperial', reading: quantitySpec('rootOpening') }))
			).toMatch(/^Root opening: cannot read/);
		}
	);

	it('refuses an empty value, naming the reading', () => {
		expect(refusal(parseLength('  ', { units: 'imperial', reading: quantitySpec('throat') }))).toBe(
			'Throat: no value given'
		);
	});

	it.each(['-1/16', '−1/16', '- 2 mm', -1])('refuses the negative %s', (input) => {
		expect(
			refusal(parseLength(input, { units: 'imperial', reading: quantitySpec('misalignment') }))
		).toMatch(/^Misalignment \(hi-lo\): cannot be negative/);
	});

	it('refuses an angle typed as a length', () => {
		expect(
			refusal(parseLength('37.5°', { units: 'imperial', reading: quantitySpec('rootFace') }))
		).toBe('Root face: "37.5°" is an angle, not a length');
	});

	it('refuses what is absurd for that reading and says how a bare number was read', () => {
		// "32" meant as 1/32 in: a bare number is inches in an imperial project.
		const message = refusal(
			parseLength('32', { units: 'imperial', reading: quantitySpec('undercutDepth') })
		);
		expect(message).toMatch(
			/^Undercut depth: 32 in \(812\.8 mm\) is more than any plausible undercut depth/
		);
		expect(message).toMatch(/bare number is read as inches/);
		expect(
			refusal(parseLength('13 in', { units: 'imperial', reading: quantitySpec('undercutLength') }))
		).toMatch(
			/^Undercut — total length in any 12 in \(300 mm\): 13 in \(330\.2 mm\) is more than any plausible undercut \(/
		);
		expect(
			parseLength('12 in', { units: 'imperial', reading: quantitySpec('undercutLength') }).ok
		).toBe(true);
	});

	it('refuses zero where zero means no weld or no part', () => {
		expect(
			refusal(parseLength('0', { units: 'imperial', reading: quantitySpec('filletLeg1') }))
		).toMatch(/^Fillet leg 1: must be more than/);
		expect(
			refusal(parseLength('0 mm', { units: 'metric', reading: quantitySpec('thickness') }))
		).toMatch(/^Thickness:/);
		expect(mm('0', { units: 'imperial', reading: quantitySpec('undercutDepth') })).toBe(0);
	});

	it('refuses a number that is not finite', () => {
		expect(
			refusal(parseLength(Number.NaN, { units: 'imperial', reading: quantitySpec('porosity') }))
		).toMatch(/^Porosity — sum of pore diameters in any 1 in \(25 mm\):/);
	});
});

describe('parseAngle', () => {
	// ASME B16.25 bevel 37.5° ± 2.5° (2+): the common pipe bevel as inspectors write it.
	it.each([
		['37.5°', 37.5],
		['37-1/2 deg', 37.5],
		['37 1/2°', 37.5],
		['37.5º', 37.5],
		['37,5°', 37.5],
		['45 degrees', 45],
		['30 deg.', 30],
		['30', 30]
	])('reads %s as %f°', (text, expected) => {
		const parsed = parseAngle(text, { reading: quantitySpec('bevelAngle') });
		expect(parsed).toMatchObject({ ok: true, value: expected, unit: 'deg' });
	});

	it('refuses a length typed as an angle, and what no bevel can be', () => {
		expect(parseAngle('3/8 in', { reading: quantitySpec('bevelAngle') })).toEqual({
			ok: false,
			message: 'Bevel angle: "3/8 in" is a length, not an angle'
		});
		expect(parseAngle('95°', { reading: quantitySpec('bevelAngle') }).ok).toBe(false);
		expect(parseAngle('90°', { reading: quantitySpec('bevelAngle') }).ok).toBe(true);
		expect(parseAngle('-5°', { reading: quantitySpec('bevelAngle') }).ok).toBe(false);
		expect(parseAngle('steep').ok).toBe(false);
	});
});

describe('formatLength', () => {
	it.each([
		[9.525, '3/8"'],
		[inchesOf(24 / 64), '3/8"'],
		[31.75, '1-1/4"'],
		[25.4, '1"'],
		[50.8, '2"'],
		[0.79375, '1/32"'],
		[0.396875, '1/64"'],
		[inchesOf(37 / 64), '37/64"'],
		[9.6, '3/8"'],
		[0, '0"'],
		[-1.5875, '-1/16"']
	])('shows %f mm as %s to the nearest 1/64 in, reduced', (value, expected) => {
		expect(formatLength(value, 'imperial')).toBe(expected);
	});

	it.each([
		[9.525, '9.5 mm'],
		[0.79375, '0.8 mm'],
		[10, '10.0 mm'],
		[0.04, '0.0 mm'],
		[-0.04, '0.0 mm']
	])('shows %f mm as %s to the nearest 0.1 mm', (value, expected) => {
		expect(formatLength(value, 'metric')).toBe(expected);
	});

	// Fillet gauge sets run from 1/8 in to 1 in (trade practice): every blade reads back as stamped.
	it('reads back every fillet gauge blade from 1/8 in to 1 in by sixteenths', () => {
		const blades = [
			'1/8',
			'3/16',
			'1/4',
			'5/16',
			'3/8',
			'7/16',
			'1/2',
			'9/16',
			'5/8',
			'11/16',
			'3/4',
			'13/16',
			'7/8',
			'15/16',
			'1'
		];
		expect(blades.map((blade) => formatLength(mm(blade), 'imperial'))).toEqual(
			blades.map((blade) => `${blade}"`)
		);
	});

	// Butt-weld reinforcement gauges read from 1/32 in to 1/8 in (trade practice).
	it('reads back every reinforcement gauge step from 1/32 in to 1/8 in', () => {
		const steps = ['1/32', '1/16', '3/32', '1/8'];
		expect(steps.map((step) => formatLength(mm(`${step}"`), 'imperial'))).toEqual(
			steps.map((step) => `${step}"`)
		);
	});

	it('round-trips every sixty-fourth up to 2 in', () => {
		for (let n = 1; n <= 128; n++) {
			const shown = formatLength(inchesOf(n / 64), 'imperial');
			expect(mm(shown)).toBeCloseTo(inchesOf(n / 64), 9);
		}
	});
});

describe('formatBoth and formatAngle', () => {
	it('shows both systems for limits and notes', () => {
		expect(formatBoth(9.525)).toBe('3/8 in (9.5 mm)');
		expect(formatBoth(31.75)).toBe('1-1/4 in (31.8 mm)');
		expect(formatBoth(0.79375)).toBe('1/32 in (0.8 mm)');
	});

	it('shows angles to 0.1°', () => {
		expect(formatAngle(37.5)).toBe('37.5°');
		expect(formatAngle(45)).toBe('45°');
		expect(formatAngle(2.54)).toBe('2.5°');
	});
});

function inchesOf(value: number): number {
	return value * 25.4;
}
