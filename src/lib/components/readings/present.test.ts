import { describe, expect, it } from 'vitest';
import {
	evaluate,
	getCriteriaSet,
	type CriteriaSet,
	type Finding,
	type JointInput,
	type JointKind,
	type Stage
} from '$lib/acceptance';
import {
	bothUnits,
	chipsFor,
	confidenceWords,
	fieldVerdict,
	limitText,
	parseTyped,
	readingsFor
} from './present';

const fillet: JointInput = {
	kind: 'fillet',
	thickness: '3/4 in',
	requiredSize: '5/16 in',
	weldLength: '24 in'
};

describe('readingsFor', () => {
	const ids = (set: string, kind: JointKind, stage: Stage) =>
		readingsFor(getCriteriaSet(set) as CriteriaSet, kind, stage).map(({ id }) => id);
	const recordedOnly = (set: string, kind: JointKind, stage: Stage) =>
		readingsFor(getCriteriaSet(set) as CriteriaSet, kind, stage)
			.filter(({ judged }) => !judged)
			.map(({ id }) => id);

	// AWS D1.1:2020: fillet visual checks are undersize (Table 8.1), convexity by face width
	// (7.23, Fig. 7.4), the leg over a root opening (7.21.1), undercut, porosity in any inch and
	// in any 12 in, and the flags.
	it('asks a fillet for its legs and throat, a butt for its profile', () => {
		expect(ids('aws-d1.1-static', 'fillet', 'visual')).toEqual([
			'rootOpening',
			'filletLeg1',
			'filletLeg2',
			'throat',
			'faceWidth',
			'convexity',
			'undercutDepth',
			'undercutLength',
			'undersizeLength',
			'porosity',
			'porosityTotal',
			'crack',
			'overlap',
			'craterUnfilled',
			'incompleteFusion'
		]);
		const butt = ids('aws-d1.1-static', 'butt', 'visual');
		expect(butt).toEqual([
			'concavity',
			'reinforcement',
			'undercutDepth',
			'undercutLength',
			'porosity',
			'porosityTotal',
			'crack',
			'overlap',
			'craterUnfilled',
			'incompleteFusion'
		]);
		// The D1.1 set makes no concavity check on groove welds; the reading is still taken.
		expect(recordedOnly('aws-d1.1-static', 'butt', 'visual')).toEqual(['concavity']);
	});

	// ISO 5817:2014 Table 1, 502: excess weld metal scales with the face width b; 507 hi-lo is
	// judged on the finished weld too.
	it('asks for the face width where a limit scales with it', () => {
		expect(ids('iso-5817-c', 'butt', 'visual')).toEqual(
			expect.arrayContaining(['faceWidth', 'misalignment', 'reinforcement'])
		);
		expect(ids('asme-b31.3-normal', 'butt', 'visual')).not.toContain('faceWidth');
	});

	// D1.1 hi-lo (7.21.3) is a butt check; bevel and root face belong to groove joints. ISO 5817
	// judges finished welds only, so its fit-up records the preparation without judging it.
	it('asks a fit-up for what the joint kind has, judged or not', () => {
		const groove = ['rootOpening', 'bevelAngle', 'rootFace', 'misalignment', 'wallThickness'];
		expect(ids('aws-d1.1-static', 'butt', 'fitup')).toEqual(groove);
		expect(ids('iso-5817-c', 'butt', 'fitup')).toEqual(groove);
		expect(recordedOnly('iso-5817-c', 'butt', 'fitup')).toEqual([
			'rootOpening',
			'bevelAngle',
			'rootFace'
		]);
		expect(ids('aws-d1.1-static', 'fillet', 'fitup')).toEqual(['rootOpening', 'wallThickness']);
		expect(ids('asme-b31.3-normal', 'branch', 'fitup')).not.toContain('misalignment');
	});
});

describe('gauge chips', () => {
	it('step undercut by 1/32 in, or 0.5 mm in a metric project', () => {
		expect(chipsFor('undercutDepth', 'imperial').map((chip) => chip.label)).toEqual([
			'0',
			'1/32',
			'1/16',
			'3/32',
			'1/8'
		]);
		expect(chipsFor('undercutDepth', 'metric').map((chip) => chip.text)).toContain('1.5 mm');
	});

	it('run fillet sizes from 1/8 to 1 in by 1/16', () => {
		const legs = chipsFor('filletLeg1', 'imperial');
		expect(legs[0]).toMatchObject({ label: '1/8', text: '1/8 in' });
		expect(legs.at(-1)?.label).toBe('1');
		expect(legs).toHaveLength(15);
		expect(legs[1].value).toBeCloseTo(25.4 * (3 / 16), 9);
	});

	it('offer the usual bevels', () => {
		expect(chipsFor('bevelAngle', 'metric').map((chip) => chip.value)).toEqual([30, 35, 37.5, 40]);
	});
});

describe('showing what was typed', () => {
	it('gives both units, the project first', () => {
		const inch = parseTyped('rootOpening', '3/8', 'imperial');
		expect(inch?.ok && bothUnits(inch, 'imperial')).toBe('= 3/8 in (9.5 mm)');
		const mm = parseTyped('rootOpening', '9,5 mm', 'metric');
		expect(mm?.ok && bothUnits(mm, 'metric')).toBe('= 9.5 mm (3/8")');
		const angle = parseTyped('bevelAngle', '37-1/2°', 'imperial');
		expect(angle?.ok && bothUnits(angle, 'imperial')).toBe('= 37.5°');
		expect(parseTyped('rootOpening', '  ', 'imperial')).toBeUndefined();
		expect(parseTyped('undercutDepth', '3/8"x', 'imperial')).toMatchObject({ ok: false });
	});

	// AWS D1.1:2020 Table 8.1 (undersized welds), L = 5/16 in → U = 1/8 in; legs 3/16 in are 1/8 in short.
	it('words limits as the project reads them', () => {
		const result = evaluate(getCriteriaSet('aws-d1.1-static') as CriteriaSet, fillet, 'visual', {
			filletLeg1: '3/16',
			filletLeg2: '3/16',
			undercutDepth: '1/32'
		});
		if (!result.ok) throw new Error('unreadable');
		const undercut = fieldVerdict(result, 'undercutDepth').finding as Finding;
		expect(limitText(undercut, 'imperial')).toBe(
			'at most 1/32"; up to 1/16" over a limited length'
		);
		expect(limitText(undercut, 'imperial', 'both')).toBe(
			'at most 1/32 in (0.8 mm); up to 1/16 in (1.6 mm) over a limited length'
		);
		expect(limitText(undercut, 'metric')).toBe(
			'at most 0.8 mm; up to 1.6 mm over a limited length'
		);
		expect(fieldVerdict(result, 'filletLeg1').finding?.check).toBe('fillet.undersize');
		expect(fieldVerdict(result, 'crack')).toEqual({});
	});

	// AWS D1.1:2020 Table 8.1 item 7, static, under 1 in: up to 1/16 in only over an accumulated
	// 2 in in any 12 in, so the depth shows the length's outcome, or waits for the length (and
	// is not within until then).
	it('shows a banded depth with the outcome of its length', () => {
		const visual = (readings: Record<string, string>) => {
			const result = evaluate(
				getCriteriaSet('aws-d1.1-static') as CriteriaSet,
				fillet,
				'visual',
				readings
			);
			if (!result.ok) throw new Error('unreadable');
			return fieldVerdict(result, 'undercutDepth');
		};
		expect(visual({ undercutDepth: '1/16' })).toMatchObject({
			finding: { check: 'undercut.depth', outcome: 'judge' },
			pending: 'undercutLength'
		});
		expect(visual({ undercutDepth: '1/16', undercutLength: '3' })).toEqual({
			finding: expect.objectContaining({ check: 'undercut.length', outcome: 'outside' })
		});
	});
});

describe('the readings every code judges', () => {
	const ids = (set: string, kind: JointKind, stage: Stage) =>
		readingsFor(getCriteriaSet(set) as CriteriaSet, kind, stage).map(({ id }) => id);

	// ASME B31.3-2018 Table 341.3.2: incomplete penetration (B), internal protrusion (L),
	// criterion K by the joint thickness at a concave surface or root.
	it('asks a B31.3 girth weld for its root side', () => {
		expect(ids('asme-b31.3-normal', 'butt', 'visual')).toEqual(
			expect.arrayContaining([
				'rootProtrusion',
				'rootConcavity',
				'jointThickness',
				'incompletePenetrationLength',
				'incompletePenetrationDepth'
			])
		);
		// Criterion J is for severe cyclic conditions only.
		expect(ids('asme-b31.3-normal', 'butt', 'visual')).not.toContain('surfaceRoughness');
		expect(ids('asme-b31.3-severe-cyclic', 'butt', 'visual')).toContain('surfaceRoughness');
	});

	// ISO 5817:2014 504: excess penetration scales with the width of the root bead.
	it('asks for the root bead width where a limit scales with it', () => {
		const iso = readingsFor(getCriteriaSet('iso-5817-c') as CriteriaSet, 'butt', 'visual');
		expect(iso.find(({ id }) => id === 'rootWidth')).toEqual({ id: 'rootWidth', judged: true });
		expect(ids('iso-5817-c', 'butt', 'visual')).toContain('poreLargest');
	});

	// AWS D1.1:2020 Table 8.1 (8)(B): the cyclic column counts pores and sizes the largest.
	it('asks a cyclic D1.1 fillet for the largest pore and their number', () => {
		expect(ids('aws-d1.1-cyclic', 'fillet', 'visual')).toEqual(
			expect.arrayContaining(['poreLargest', 'poreCount'])
		);
	});

	it('reads counts and roughness as they are typed', () => {
		expect(parseTyped('poreCount', '2', 'imperial')).toEqual({ ok: true, value: 2, unit: 'count' });
		expect(parseTyped('poreCount', 'two', 'imperial')).toMatchObject({ ok: false });
		const rough = parseTyped('surfaceRoughness', '500', 'imperial');
		expect(rough).toMatchObject({ ok: true, unit: 'um' });
		if (!rough?.ok) throw new Error('unreadable');
		expect(rough.value).toBeCloseTo(12.7, 9);
		expect(bothUnits(rough, 'imperial')).toBe('= 500 µin Ra (12.7 µm)');
		expect(bothUnits({ ok: true, value: 12.5, unit: 'um' }, 'metric')).toBe('= 12.5 µm Ra');
		expect(bothUnits({ ok: true, value: 1, unit: 'count' }, 'metric')).toBe('= 1 pore');
		expect(chipsFor('poreCount', 'metric').map((chip) => chip.text)).toEqual(['0', '1', '2', '3']);
		expect(chipsFor('surfaceRoughness', 'imperial').map((chip) => chip.label)).toEqual([
			'125',
			'250',
			'500'
		]);
	});
});

describe('limits shown, whatever the reading', () => {
	// ISO 5817:2014 507 (unconfirmed), level C, t = 7.3 mm: plates 0.15t = 1.095 mm,
	// circumferential welds 0.5t capped at 3 mm.
	it('shows the same hi-lo limit for 0.8, 2.5 and 3.2 mm on a joint that does not say which', () => {
		const texts = [0.8, 2.5, 3.2].map((misalignment) => {
			const result = evaluate(
				getCriteriaSet('iso-5817-c') as CriteriaSet,
				{ kind: 'butt', thickness: 7.3 },
				'fitup',
				{ misalignment },
				{ units: 'metric' }
			);
			if (!result.ok) throw new Error('unreadable');
			return limitText(fieldVerdict(result, 'misalignment').finding as Finding, 'metric');
		});
		expect(new Set(texts)).toEqual(new Set(['at most 1.1 mm or 3.0 mm, by joint data not given']));
	});

	it('never words a limit as resting on memory', () => {
		for (const words of Object.values(confidenceWords)) {
			expect(words ?? '').not.toMatch(/memory/i);
		}
		expect(confidenceWords.mem).toBe('unconfirmed — check the clause');
		expect(confidenceWords['1']).toBe('unconfirmed — check the clause');
	});
});
