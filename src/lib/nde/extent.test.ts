import { describe, expect, it } from 'vitest';
import {
	CATEGORY_M,
	clauseWords,
	codeExtent,
	extentFor,
	extentsForKind,
	readLotRule,
	requiredCount,
	type LotRule
} from './extent';
import { groupOf, isoWeek, lotLabel, type GroupedJoint } from './lots';

const rule = (extents: LotRule['extents'] = {}): LotRule => ({
	groupBy: 'line',
	everyWelder: true,
	extents,
	contractorEmail: ''
});

describe('the extent the code asks of a criteria set', () => {
	it('asks 5 % RT of butt welds in normal fluid service (ASME B31.3-2018 341.4.1(b)(1))', () => {
		const extents = codeExtent('asme-b31.3-normal').extents;
		expect(extents).toEqual([{ method: 'RT', percent: 5, kinds: ['butt'] }]);
		expect(extentsForKind(extents, 'butt')).toHaveLength(1);
		// Fillet and socket welds are outside the volumetric sample of 341.4.1(b)(1).
		expect(extentsForKind(extents, 'fillet')).toEqual([]);
		expect(extentsForKind(extents, 'socket')).toEqual([]);
	});

	it('asks 100 % of butt and branch welds in severe cyclic service (ASME B31.3-2018 341.4.3(b)), marked unconfirmed', () => {
		const severe = codeExtent('asme-b31.3-severe-cyclic');
		expect(severe.extents).toEqual([{ method: 'RT', percent: 100, kinds: ['butt', 'branch'] }]);
		expect(clauseWords(severe)).toBe('ASME B31.3-2018 341.4.3(b) (unconfirmed — check the clause)');
	});

	it('asks visual only in Category D (ASME B31.3-2018 341.4.2), and 20 % in Category M (M341.4)', () => {
		expect(codeExtent('asme-b31.3-category-d').extents).toEqual([]);
		expect(CATEGORY_M.extents[0].percent).toBe(20);
		expect(CATEGORY_M.confirmed).toBe(false);
	});

	it('names no extent for codes that leave it to the contract (AWS D1.1, ISO 5817, API 1104)', () => {
		for (const id of ['aws-d1.1-static', 'iso-5817-c', 'api-1104', 'unknown-set'])
			expect(codeExtent(id).extents).toEqual([]);
	});

	it("takes the project's figure for the set, else for the set it derives from, else the code's", () => {
		const owner = [{ method: 'RT' as const, percent: 10, kinds: ['butt' as const] }];
		const m = [{ method: 'RT' as const, percent: 20, kinds: ['butt' as const] }];
		const r = rule({ 'asme-b31.3-normal': owner, 'cat-m': m });
		expect(extentFor(r, ['cat-m', 'asme-b31.3-normal'])).toBe(m);
		expect(extentFor(r, ['own-normal', 'asme-b31.3-normal'])).toBe(owner);
		expect(extentFor(rule(), ['own-normal', 'asme-b31.3-normal'])[0].percent).toBe(5);
		// An empty list in the settings means no NDE sampling for that set.
		expect(extentFor(rule({ 'asme-b31.3-normal': [] }), ['asme-b31.3-normal'])).toEqual([]);
	});
});

describe('sample size', () => {
	it('rounds the percent up (ASME B31.3-2018 341.4.1(b)(1): "not less than 5 %")', () => {
		expect(requiredCount(20, 5)).toBe(1);
		expect(requiredCount(21, 5)).toBe(2);
		expect(requiredCount(1, 5)).toBe(1);
		expect(requiredCount(100, 5)).toBe(5);
		expect(requiredCount(101, 5)).toBe(6);
		expect(requiredCount(5000, 5)).toBe(250);
		expect(requiredCount(10, 20)).toBe(2);
		expect(requiredCount(7, 100)).toBe(7);
		expect(requiredCount(0, 5)).toBe(0);
		expect(requiredCount(30, 0)).toBe(0);
		// 10 % of 30 is exactly 3, not 4 through floating-point dust.
		expect(requiredCount(30, 10)).toBe(3);
	});
});

describe('the stored lot rule', () => {
	it('reads an older rule: its percent is the figure for B31.3 normal service where it departs from the code', () => {
		expect(readLotRule({ groupBy: 'line', percent: { RT: 5 }, everyWelder: true })).toEqual(rule());
		expect(
			readLotRule({ groupBy: 'week', percent: { RT: 10, UT: 0 }, everyWelder: false })
		).toEqual({
			groupBy: 'week',
			everyWelder: false,
			extents: { 'asme-b31.3-normal': [{ method: 'RT', percent: 10, kinds: ['butt'] }] },
			contractorEmail: ''
		});
	});

	it('drops what it cannot read rather than guessing', () => {
		expect(
			readLotRule({
				groupBy: 'galaxy',
				extents: {
					a: [
						{ method: 'XR', percent: 5, kinds: ['butt'] },
						{ method: 'UT', percent: 150, kinds: ['butt'] },
						{ method: 'MT', percent: 10, kinds: ['fillet', 'plate'] }
					]
				},
				contractorEmail: 42
			})
		).toEqual({
			groupBy: 'line',
			everyWelder: true,
			extents: { a: [{ method: 'MT', percent: 10, kinds: ['fillet'] }] },
			contractorEmail: ''
		});
		expect(readLotRule(null)).toEqual(rule());
	});
});

describe('lots', () => {
	it('numbers weeks as ISO 8601 does (Monday first; week 1 holds the first Thursday)', () => {
		expect(isoWeek('2026-01-01')).toBe('2026-W01'); // a Thursday
		expect(isoWeek('2021-01-03')).toBe('2020-W53'); // a Sunday, still 2020's last week
		expect(isoWeek('2021-01-04')).toBe('2021-W01');
		expect(isoWeek('2024-12-30')).toBe('2025-W01'); // a Monday, already 2025's first week
		expect(isoWeek('2026-10-12')).toBe('2026-W42');
		expect(isoWeek('not a date')).toBe('');
	});

	it('groups a weld by the project rule and names the lot', () => {
		const joint: GroupedJoint = {
			location: 'field',
			line: '',
			drawingLine: '6"-SG-2001-A1A',
			system: 'TP-20-01',
			drawing: 'LBM-20-ISO-1101',
			weldedOn: '2026-10-12',
			rootStamp: 'B14'
		};
		expect(groupOf('line', joint)).toEqual({ key: '6"-SG-2001-A1A', words: 'Line 6"-SG-2001-A1A' });
		expect(groupOf('line', { ...joint, line: '6"-SG-2002-A1A' }).key).toBe('6"-SG-2002-A1A');
		expect(groupOf('system', joint).key).toBe('TP-20-01');
		expect(groupOf('drawing', joint).key).toBe('LBM-20-ISO-1101');
		expect(groupOf('week', joint).key).toBe('2026-W42');
		expect(groupOf('welder', joint).key).toBe('B14');
		expect(groupOf('location', joint)).toEqual({ key: 'field', words: 'Field welds' });
		expect(lotLabel('Line 6"-SG-2001-A1A', 'RT', 5, 1)).toBe('Line 6"-SG-2001-A1A · RT 5 %');
		expect(lotLabel('Week 2026-W42', 'UT', 10, 2)).toBe('Week 2026-W42 · UT 10 % (2)');
	});
});
