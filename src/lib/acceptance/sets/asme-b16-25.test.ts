/**
 * ASME B16.25-2017 buttwelding ends. Sources are those of reference/standards.md §4 [2+].
 */
import { describe, expect, it } from 'vitest';
import { checker, evaluated, finding } from '../testing';
import type { JointInput } from '../types';

const B1625 = 'asme-b16.25';
// NPS 6 Sch 40: 0.280 in wall.
const pipe = (thickness: string | number = '0.280 in'): JointInput => ({ kind: 'butt', thickness });

describe('bevel angle — 37.5° ± 2.5° over 3 mm (0.12 in) of wall', () => {
	const bevel = checker(B1625, 'bevelAngle.range', 'fitup');

	// The common pipe bevel, 37-1/2° (trade practice and B16.25).
	it.each(['37-1/2°', '37.5', '35°', '40 deg', '36'])('takes %s', (angle) => {
		expect(bevel(pipe(), { bevelAngle: angle })).toBe('within');
	});

	it.each(['34.9°', '40.1°', '30°', '45°'])('rejects %s', (angle) => {
		expect(bevel(pipe(), { bevelAngle: angle })).toBe('outside');
	});

	it('reports the bound that governs and the whole range', () => {
		expect(
			finding(B1625, pipe(), 'fitup', { bevelAngle: '41°' }, 'bevelAngle.range')
		).toMatchObject({
			limit: 40,
			range: { min: 35, max: 40 },
			unit: 'deg'
		});
		expect(finding(B1625, pipe(), 'fitup', { bevelAngle: '36°' }, 'bevelAngle.range').limit).toBe(
			35
		);
	});

	// Over 22 mm the lower part of the compound bevel is still 37.5° ± 2.5°.
	it('keeps 37.5° ± 2.5° for the lower part of a compound bevel over 22 mm', () => {
		expect(bevel(pipe('1.5 in'), { bevelAngle: '37.5°' })).toBe('within');
		expect(bevel(pipe('1.5 in'), { bevelAngle: '10°' })).toBe('outside');
	});

	it('leaves walls of 3 mm (0.12 in) and less, square cut or chamfered, to the inspector', () => {
		expect(bevel(pipe('0.12 in'), { bevelAngle: '0°' })).toBe('judge');
		expect(bevel(pipe('0.13 in'), { bevelAngle: '37.5°' })).toBe('within');
		const metric = checker(B1625, 'bevelAngle.range', 'fitup', { units: 'metric' });
		expect(metric(pipe('3 mm'), { bevelAngle: '37.5°' })).toBe('judge');
		expect(metric(pipe('3.1 mm'), { bevelAngle: '37.5°' })).toBe('within');
	});

	it('asks for the wall when it is not given', () => {
		const result = evaluated(B1625, { kind: 'butt' }, 'fitup', { bevelAngle: '37.5°' });
		expect(result.findings[0].outcome).toBe('judge');
		expect(result.missingJoint).toEqual(['thickness']);
	});
});

describe('root face — 1.6 ± 0.8 mm (1/16 ± 1/32 in)', () => {
	const land = checker(B1625, 'rootFace.range', 'fitup');

	// Fit-up is judged against 1/16 in and 3/32 in (trade practice): the land runs 1/32 to 3/32 in.
	it.each(['1/16', '1/32', '3/32'])('takes %s in', (face) => {
		expect(land(pipe(), { rootFace: face })).toBe('within');
	});

	it.each(['1/64', '7/64', '1/8'])('rejects %s in', (face) => {
		expect(land(pipe(), { rootFace: face })).toBe('outside');
	});

	it('uses 0.8–2.4 mm in a metric project', () => {
		const metric = checker(B1625, 'rootFace.range', 'fitup', { units: 'metric' });
		expect(metric(pipe(7.11), { rootFace: '1.6 mm' })).toBe('within');
		expect(metric(pipe(7.11), { rootFace: '0.8 mm' })).toBe('within');
		expect(metric(pipe(7.11), { rootFace: '2.4 mm' })).toBe('within');
		expect(metric(pipe(7.11), { rootFace: '0.7 mm' })).toBe('outside');
		expect(metric(pipe(7.11), { rootFace: '2.5 mm' })).toBe('outside');
	});
});

describe('scope', () => {
	it('makes no visual checks, so a visual verdict is for the inspector', () => {
		const result = evaluated(B1625, pipe(), 'visual', { reinforcement: '1/16', crack: false });
		expect(result.findings).toEqual([]);
		expect(result.verdict).toBe('judge');
	});

	it('is within for a good end preparation', () => {
		const result = evaluated(B1625, pipe(), 'fitup', {
			bevelAngle: '37-1/2 deg',
			rootFace: '1/16'
		});
		expect(result.verdict).toBe('within');
		expect(result.missing).toEqual([]);
	});
});
