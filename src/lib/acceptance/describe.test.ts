/**
 * Limits in words, as the settings page shows a base set's values. Unless a case names another
 * source, the limits are those of the built-in sets, which cite their own clauses.
 */
import { describe, expect, it } from 'vitest';
import { getCriteriaSet, type CriteriaSet } from './index';
import { exprWords, lengthWords, limitUnit, ruleWords, typedValue } from './describe';

const set = (id: string) => getCriteriaSet(id) as CriteriaSet;

describe('ruleWords', () => {
	// ASME B31.3-2018 Table 341.3.2 criterion H: ≤ 1 mm (1/32 in) and ≤ Tw/4, the lesser
	// governing; longitudinal groove welds take criterion A (none).
	it('reads B31.3 normal undercut in the project column', () => {
		const rule = set('asme-b31.3-normal').limits['undercut.depth']!.rule;
		expect(ruleWords(rule, 'mm', 'imperial')).toBe(
			'at most (the lesser of 1/32 in and 0.25 × thickness, none for longitudinal seams) at any length'
		);
		expect(ruleWords(rule, 'mm', 'metric')).toBe(
			'at most (the lesser of 1 mm and 0.25 × thickness, none for longitudinal seams) at any length'
		);
	});

	// AWS D1.1:2020 Table 8.1, statically loaded, under 1 in: 1/32 in at any length, up to
	// 1/16 in for an accumulated 2 in in any 12 in; 1 in and over, 1/16 in.
	it('reads a banded limit with its length allowance', () => {
		const rule = set('aws-d1.1-static').limits['undercut.depth']!.rule;
		expect(ruleWords(rule, 'mm', 'imperial')).toBe(
			'at most (by thickness, under 1 in: 1/32 in; over that: 1/16 in) at any length; deeper, up to 1/16 in, over at most 2 in in any 12 in'
		);
	});

	// ASME B31.3-2018 Fig. 328.5.2C: about 1.5 mm (1/16 in) gap before welding a socket weld.
	it('reads a least value with the band the inspector judges', () => {
		const rule = set('asme-b31.3-normal').limits['socket.gap']!.rule;
		expect(ruleWords(rule, 'mm', 'metric')).toBe(
			'at least 1.5 mm; less, but more than 0 mm, the inspector judges'
		);
	});

	it('reads flags, and limits left to the WPS once', () => {
		expect(ruleWords({ type: 'absent' }, 'flag', 'imperial')).toBe('none allowed');
		expect(ruleWords({ type: 'absent', beyond: 'judge' }, 'flag', 'imperial')).toBe(
			'none allowed; past that the inspector judges'
		);
		// B31.3 328.4.2 leaves joint preparation to the WPS.
		const bevel = set('asme-b31.3-normal').limits['bevelAngle.range']!.rule;
		expect(ruleWords(bevel, 'deg', 'imperial')).toBe(
			'no fixed number: Bevel angle as the WPS specifies.'
		);
		expect(ruleWords({ type: 'range', min: 30, max: 40 }, 'deg', 'metric')).toBe('30° to 40°');
		// B31.3 328.4.3 gives no number for hi-lo.
		expect(
			ruleWords(set('asme-b31.3-normal').limits['misalignment.max']!.rule, 'mm', 'imperial')
		).toMatch(/^no fixed number: B31\.3 gives no number/);
	});

	// ISO 5817:2014 Table 1, 5213 (insufficient throat), level C: no number checked for t ≤ 3 mm.
	it('reads a note inside a stepped limit as an aside, without a stray full stop', () => {
		const rule = set('iso-5817-c').limits['fillet.throat.min']!.rule;
		expect(ruleWords(rule, 'mm', 'metric')).toMatch(
			/^at most \(by thickness, up to 3 mm: \(no fixed number: Insufficient throat on walls of 3 mm and less is not built in\); over that: /
		);
		for (const id of ['aws-d1.1-static', 'asme-b31.3-normal', 'api-1104', 'iso-5817-b']) {
			for (const [check, limit] of Object.entries(set(id).limits)) {
				const words = ruleWords(limit!.rule, limitUnit(check as never), 'metric');
				expect(words, `${id} ${check}`).not.toMatch(/\.[;)]/);
			}
		}
	});
});

describe('exprWords', () => {
	// ISO 5817:2014 Table 1, 5011 (undercut), level C: h ≤ 0.1 t, at most 0.5 mm (t > 3 mm).
	it('leaves out a zero addend', () => {
		expect(
			exprWords(
				{ lesserOf: [{ of: 'thickness', times: 0.1, plus: 0 }, 0.5] },
				{
					unit: 'mm',
					units: 'metric'
				}
			)
		).toBe('the lesser of 0.1 × thickness and 0.5 mm');
	});
});

describe('lengths and typed values', () => {
	it('show a whole 1/64 in as a fraction, anything else with its millimetres', () => {
		expect(lengthWords(25.4 / 64, 'imperial')).toBe('1/64 in');
		expect(lengthWords(25.4 * 1.25, 'imperial')).toBe('1-1/4 in');
		expect(lengthWords(0.5, 'imperial')).toBe('0.020 in (0.5 mm)');
		expect(lengthWords(0.25, 'metric')).toBe('0.25 mm');
	});

	it('type back exactly what was stored', () => {
		expect(typedValue(25.4 / 32, 'mm', 'imperial')).toBe('1/32 in');
		expect(typedValue(0.5, 'mm', 'imperial')).toBe('0.5 mm');
		expect(typedValue(0.8, 'mm', 'metric')).toBe('0.8 mm');
		expect(typedValue(37.5, 'deg', 'metric')).toBe('37.5°');
	});

	it('know what each check is measured in', () => {
		expect(limitUnit('crack')).toBe('flag');
		expect(limitUnit('bevelAngle.range')).toBe('deg');
		expect(limitUnit('undercut.depth')).toBe('mm');
		expect(limitUnit('pore.count')).toBe('count');
		expect(limitUnit('surfaceFinish.max')).toBe('um');
	});

	// ASME B31.3-2018 Table 341.3.2 criterion J: 500 µin Ra per ASME B46.1 (12.5 µm in SI).
	it('read a roughness limit in the project column', () => {
		const rule = set('asme-b31.3-severe-cyclic').limits['surfaceFinish.max']!.rule;
		expect(ruleWords(rule, 'um', 'imperial')).toBe('at most 500 µin Ra (12.7 µm)');
		expect(ruleWords(rule, 'um', 'metric')).toBe('at most 12.5 µm Ra');
		expect(typedValue(12.5, 'um', 'metric')).toBe('12.5 µm');
		expect(typedValue(2, 'count', 'metric')).toBe('2');
	});

	// B31.3-2018 Table 341.3.2 criteria B and C: cumulative length ≤ 38 mm (1.5 in) in any 150 mm (6 in).
	it('read an accumulated length with the stretch it counts over', () => {
		const rule = set('asme-b31.3-normal').limits['penetration.length']!.rule;
		expect(ruleWords(rule, 'mm', 'metric')).toBe(
			'at most (38 mm, none for longitudinal seams) in any 150 mm'
		);
	});
});
