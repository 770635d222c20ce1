/**
 * A fit-up judged against the joint design of the joint's WPS. The WPS ranges here are of an
 * invented procedure; the code limits beside them are ASME B31.3-2018 328.4.2 (joint
 * preparation left to the WPS, common practice) and ASME B16.25-2017 (37.5° ± 2.5° bevel [2+]).
 */
import { describe, expect, it } from 'vitest';
import { evaluate } from './evaluate';
import { getCriteriaSet } from './index';
import { evaluated } from './testing';
import type { JointInput, WpsJointDesign } from './types';

const NORMAL = 'asme-b31.3-normal';
const pipe: JointInput = { kind: 'butt', thickness: 7.11, diameter: 168.3 };
const metric = { units: 'metric' } as const;
const wps: WpsJointDesign = {
	number: 'WPS-CS-07',
	revision: '2',
	rootOpening: { min: 1.5, max: 3 },
	rootFace: { min: 1, max: 2 },
	bevelAngle: { min: 30, max: 35 }
};
const fitup = { rootOpening: 2, rootFace: 1.5, bevelAngle: 32.5, misalignment: 0 };

describe('a fit-up against the WPS joint design', () => {
	it('is within when every dimension is within the WPS, with the WPS named as the clause', () => {
		const result = evaluated(NORMAL, pipe, 'fitup', fitup, { ...metric, wps });
		expect(result.verdict).toBe('within');
		expect(result.findings.map((f) => f.check)).toEqual([
			'misalignment.max',
			'wps.rootOpening',
			'wps.bevelAngle',
			'wps.rootFace'
		]);
		const root = result.findings.find((f) => f.check === 'wps.rootOpening')!;
		expect(root).toMatchObject({
			clause: 'WPS WPS-CS-07 rev 2',
			confidence: 'project',
			range: { min: 1.5, max: 3 },
			outcome: 'within'
		});
	});

	// Values on both sides of and exactly on each bound of the WPS ranges.
	it.each([
		['rootOpening', 1.5, 'within'],
		['rootOpening', 1.4, 'outside'],
		['rootOpening', 3, 'within'],
		['rootOpening', 3.1, 'outside'],
		['rootFace', 1, 'within'],
		['rootFace', 0.9, 'outside'],
		['rootFace', 2, 'within'],
		['rootFace', 2.1, 'outside'],
		['bevelAngle', 30, 'within'],
		['bevelAngle', 29.5, 'outside'],
		['bevelAngle', 35, 'within'],
		['bevelAngle', 35.5, 'outside']
	] as const)('%s %f is %s', (reading, value, outcome) => {
		const result = evaluated(
			NORMAL,
			pipe,
			'fitup',
			{ ...fitup, [reading]: value },
			{ ...metric, wps }
		);
		expect(result.findings.find((f) => f.check === `wps.${reading}`)?.outcome).toBe(outcome);
		expect(result.verdict).toBe(outcome);
	});

	it('keeps a code limit that has its own number beside the WPS (B16.25 bevel)', () => {
		const result = evaluated(
			'asme-b16.25',
			pipe,
			'fitup',
			{ ...fitup, bevelAngle: 34 },
			{
				...metric,
				wps
			}
		);
		expect(result.findings.find((f) => f.check === 'bevelAngle.range')?.outcome).toBe('outside');
		expect(result.findings.find((f) => f.check === 'wps.bevelAngle')?.outcome).toBe('within');
		expect(result.verdict).toBe('outside');
	});

	it('leaves the code to the inspector where the WPS gives no range', () => {
		const partial: WpsJointDesign = {
			number: 'WPS-CS-07',
			revision: '2',
			rootOpening: { min: 1.5, max: 3 }
		};
		const result = evaluated(NORMAL, pipe, 'fitup', fitup, { ...metric, wps: partial });
		expect(result.findings.find((f) => f.check === 'bevelAngle.range')?.outcome).toBe('judge');
		expect(result.findings.some((f) => f.check === 'rootOpening.range')).toBe(false);
		expect(result.verdict).toBe('judge');
	});

	it('asks for a reading the WPS limits', () => {
		const { rootFace: _rootFace, ...withoutFace } = fitup;
		const result = evaluated(NORMAL, pipe, 'fitup', withoutFace, { ...metric, wps });
		expect(result.missing).toContain('rootFace');
		expect(result.verdict).toBe('judge');
	});

	it('judges groove joints only, and fit-up only', () => {
		const fillet = evaluated(
			NORMAL,
			{ kind: 'fillet', thickness: 6 },
			'fitup',
			{ rootOpening: 5 },
			{
				...metric,
				wps
			}
		);
		expect(fillet.findings.some((f) => f.check.startsWith('wps.'))).toBe(false);
		const visual = evaluated(NORMAL, pipe, 'visual', { crack: false }, { ...metric, wps });
		expect(visual.findings.some((f) => f.check.startsWith('wps.'))).toBe(false);
	});

	it('refuses a WPS range it cannot use, naming the field', () => {
		const set = getCriteriaSet(NORMAL)!;
		const bad = evaluate(set, pipe, 'fitup', fitup, {
			...metric,
			wps: { ...wps, rootOpening: { min: 3, max: 1.5 }, revision: ' ' }
		});
		expect(bad.ok === false && bad.errors).toEqual([
			{ field: 'wps.revision', message: 'The WPS needs its revision' },
			{ field: 'wps.rootOpening', message: 'WPS rootOpening: the min is more than the max' }
		]);
	});
});
