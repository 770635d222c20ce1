/**
 * The NDE form's indications list and the words for its findings. The limits read here are
 * API Std 1104 21st ed. 9.3.1 (IP at most 1 in) [2+] and 9.3.8.2 (ISI at most four in any
 * 12 in) [2+], as the engine's own tests cite them.
 */
import { describe, expect, it } from 'vitest';
import { evaluateIndications, getCriteriaSet, type CriteriaSet } from '$lib/acceptance';
import {
	blankIndication,
	dimensionsFor,
	findingLabel,
	indicationInputs,
	limitWords,
	measuredText
} from './indications';

const api = getCriteriaSet('api-1104') as CriteriaSet;
const nps12 = { kind: 'butt' as const, thickness: '0.375 in', diameter: '12.75 in' };

describe('the indications list', () => {
	it('gives the engine what was typed, blank dimensions left out', () => {
		expect(
			indicationInputs([
				{ ...blankIndication('incompletePenetration'), length: ' 1 in ', position: '' },
				{ ...blankIndication('internalConcavity'), length: '3', darker: false }
			])
		).toEqual([
			{ type: 'incompletePenetration', length: '1 in' },
			{ type: 'internalConcavity', length: '3', darker: false }
		]);
	});

	it('asks each kind for what the codes judge it by', () => {
		expect(dimensionsFor('incompletePenetration', 'RT')).toEqual(['length', 'depth', 'position']);
		expect(dimensionsFor('elongatedSlag', 'RT')).toEqual(['length', 'width', 'position']);
		expect(dimensionsFor('burnThrough', 'RT')).toEqual(['length', 'position', 'darker']);
		expect(dimensionsFor('elongatedSlag', 'UT')).toEqual(['length', 'width', 'depth', 'position']);
	});
});

describe('findings in words', () => {
	it('names the kind, the dimension and the limit', () => {
		const result = evaluateIndications(api, nps12, 'RT', [
			{ type: 'incompletePenetration', length: '1-1/16 in', position: '2 in' }
		]);
		if (!result.ok) throw new Error('unreadable');
		const length = result.findings.find((f) => f.check === 'nde.incompletePenetration.length')!;
		expect(findingLabel(length)).toBe('Incomplete penetration (IP): longest');
		expect(measuredText(length, 'imperial')).toBe('1-1/16 in (27.0 mm)');
		expect(limitWords(length, 'imperial')).toBe('at most 1 in (25.4 mm)');
		// A metric project judges by the SI column: 25 mm.
		const metric = evaluateIndications(
			api,
			nps12,
			'RT',
			[{ type: 'incompletePenetration', length: '27 mm' }],
			{ units: 'metric' }
		);
		if (!metric.ok) throw new Error('unreadable');
		const si = metric.findings.find((f) => f.check === 'nde.incompletePenetration.length')!;
		expect(limitWords(si, 'metric')).toBe('at most 25.0 mm');
	});

	it('words counts, groups and what is not allowed at all', () => {
		const result = evaluateIndications(api, nps12, 'RT', [
			{ type: 'crack', length: '1/8' },
			...['1', '2', '3', '4', '5'].map((position) => ({
				type: 'isolatedSlag' as const,
				length: '1/16',
				width: '1/16',
				position
			}))
		]);
		if (!result.ok) throw new Error('unreadable');
		const crack = result.findings.find((f) => f.check === 'nde.crack.present')!;
		expect(limitWords(crack, 'imperial')).toBe('none allowed');
		const count = result.findings.find((f) => f.check === 'nde.isolatedSlag.count')!;
		expect([measuredText(count, 'metric'), limitWords(count, 'metric')]).toEqual([
			'5',
			'at most 4'
		]);
		const group = result.findings.find((f) => f.check === 'nde.group.accumulation')!;
		expect(findingLabel(group)).toBe('All imperfections together, in the worst stretch');
	});
});
