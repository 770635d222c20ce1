/**
 * Engine behaviour. Unless a case names another source, the limits used are AWS D1.1:2020
 * Table 8.1 [2+] (undercut 1/32 in under 1 in of material, cracks, porosity) and API 1104
 * 21st ed. 7.2 [1] (hi-lo 1/8 in, a "should").
 */
import { describe, expect, it } from 'vitest';
import {
	builtInCriteriaSetIds,
	checkIds,
	criteriaSets,
	CriteriaSetError,
	deriveCriteriaSet,
	evaluate,
	getCriteriaSet,
	type CriteriaSet,
	type JointInput
} from './index';
import { evaluated, finding, inches } from './testing';

const d11 = getCriteriaSet('aws-d1.1-static') as CriteriaSet;
const api = getCriteriaSet('api-1104') as CriteriaSet;
const noDefects = { crack: false, overlap: false, craterUnfilled: false, incompleteFusion: false };
const plate: JointInput = { kind: 'butt', thickness: '3/4 in', stress: 'parallel' };

describe('the built-in criteria sets', () => {
	it('are exactly the ten the product ships', () => {
		expect(builtInCriteriaSetIds).toEqual([
			'aws-d1.1-static',
			'aws-d1.1-cyclic',
			'asme-b31.3-normal',
			'asme-b31.3-severe-cyclic',
			'asme-b31.3-category-d',
			'api-1104',
			'asme-b16.25',
			'iso-5817-b',
			'iso-5817-c',
			'iso-5817-d'
		]);
		expect(getCriteriaSet('api-1104')).toBe(api);
		expect(getCriteriaSet('aws-d1.1')).toBeUndefined();
	});

	it('each name a standard and edition, and start at version 1', () => {
		for (const set of criteriaSets) {
			expect(set.standard, set.id).not.toBe('');
			expect(set.edition, set.id).toMatch(/\d{4}/);
			expect(set.version, set.id).toBe(1);
			expect(Object.keys(set.limits).length, set.id).toBeGreaterThan(0);
		}
	});

	// Every limit resting on one source or on none keeps its tag and says why in a note; the
	// notes are shown to inspectors, so they speak of the code, never of "memory" or "we".
	it('give every limit a clause, a note where it rests on one source or none, in plain words', () => {
		for (const set of criteriaSets) {
			for (const [check, limit] of Object.entries(set.limits)) {
				expect(checkIds, `${set.id} ${check}`).toContain(check);
				expect(limit.clause, `${set.id} ${check}`).not.toBe('');
				if (limit.confidence === '1' || limit.confidence === 'mem') {
					expect(limit.note, `${set.id} ${check}`).toBeTruthy();
				}
				expect(limit.note ?? '', `${set.id} ${check}`).not.toMatch(/memory|\bwe\b|\bour\b/i);
			}
			for (const [method, criteria] of Object.entries(set.volumetric ?? {})) {
				expect(criteria.clause, `${set.id} ${method}`).not.toBe('');
				for (const [type, limit] of Object.entries(criteria.limits)) {
					expect(limit.clause, `${set.id} ${method} ${type}`).not.toBe('');
					const words = `${limit.note ?? ''} ${limit.open ?? ''}`;
					expect(words, `${set.id} ${method} ${type}`).not.toMatch(/memory|\bwe\b/i);
				}
			}
		}
	});

	it('are plain data that survive a JSON round trip', () => {
		for (const set of criteriaSets) {
			expect(JSON.parse(JSON.stringify(set)), set.id).toEqual(set);
		}
	});
});

describe('evaluate', () => {
	it('is within when every check is within and nothing it needs is missing', () => {
		const result = evaluate(d11, plate, 'visual', {
			...noDefects,
			undercutDepth: '1/32',
			porosity: 0,
			reinforcement: '1/16'
		});
		expect(result).toMatchObject({ ok: true, verdict: 'within', missing: [], missingJoint: [] });
	});

	it('is outside when any finding is outside, whatever else is missing or judged', () => {
		const result = evaluated(d11, { kind: 'butt' }, 'visual', { crack: true, porosity: '1/4' });
		expect(result.findings.find((f) => f.check === 'porosity.max')?.outcome).toBe('judge');
		expect(result.verdict).toBe('outside');
	});

	it('is judge when a finding needs the inspector', () => {
		const result = evaluated(api, { kind: 'butt', thickness: '1/2 in' }, 'fitup', {
			misalignment: '9/64'
		});
		expect(result.findings.map((f) => f.outcome)).toEqual(['judge']);
		expect(result.verdict).toBe('judge');
	});

	it('is judge, not within, while readings the stage needs are missing', () => {
		const result = evaluated(d11, plate, 'visual', { undercutDepth: '1/32' });
		expect(result.findings.every((f) => f.outcome === 'within')).toBe(true);
		expect(result.missing).toEqual([
			'reinforcement',
			'porosity',
			'crack',
			'overlap',
			'craterUnfilled',
			'incompleteFusion'
		]);
		expect(result.verdict).toBe('judge');
	});

	it('is judge when nothing could be checked', () => {
		expect(evaluated(d11, { kind: 'butt' }, 'fitup', {}).verdict).toBe('judge');
	});

	it('lists what a fillet visual normally needs', () => {
		const result = evaluated(
			d11,
			{ kind: 'fillet', requiredSize: '1/4', weldLength: '12' },
			'visual',
			{}
		);
		expect(result.missing).toEqual([
			'filletLeg1',
			'filletLeg2',
			'convexity',
			'undercutDepth',
			'porosity',
			'crack',
			'overlap',
			'craterUnfilled',
			'incompleteFusion'
		]);
		expect(result.findings).toEqual([]);
	});

	it('ignores readings no check of this stage and joint needs, and ids it does not know', () => {
		const result = evaluated(d11, { kind: 'fillet', requiredSize: '1/4' }, 'visual', {
			filletLeg1: '1/4',
			filletLeg2: '1/4',
			reinforcement: '1/2',
			bevelAngle: '10°',
			colour: 'blue',
			rootOpening: ''
		});
		expect(result.findings.map((f) => f.check)).toEqual(['fillet.undersize']);
	});

	it('treats blank readings as not given', () => {
		const result = evaluated(d11, plate, 'visual', {
			undercutDepth: '  ',
			crack: null,
			porosity: undefined
		});
		expect(result.findings).toEqual([]);
		expect(result.missing).toContain('undercutDepth');
	});

	it('reads yes/no answers as flags', () => {
		expect(finding(d11, plate, 'visual', { crack: 'yes' }, 'crack')).toMatchObject({
			measured: 1,
			outcome: 'outside'
		});
		expect(finding(d11, plate, 'visual', { crack: 'No' }, 'crack')).toMatchObject({
			measured: 0,
			outcome: 'within'
		});
	});

	it('echoes the criteria set and its version', () => {
		expect(evaluated(api, plate, 'visual', {}).criteria).toEqual({
			id: 'api-1104',
			name: 'API 1104 pipeline girth welds',
			standard: 'API Std 1104',
			edition: '21st edition (2013)',
			version: 1
		});
	});
});

describe('exactly on a limit', () => {
	// D1.1 static undercut 1/32 in [2+]; 1/32 in = 0.79375 mm, which floats cannot hold exactly.
	it('is within, typed or sent as millimetres', () => {
		expect(finding(d11, plate, 'visual', { undercutDepth: '1/32' }, 'undercut.depth').outcome).toBe(
			'within'
		);
		expect(
			finding(d11, plate, 'visual', { undercutDepth: '0.03125 in' }, 'undercut.depth').outcome
		).toBe('within');
		expect(
			finding(d11, plate, 'visual', { undercutDepth: 0.79375 }, 'undercut.depth').limit
		).toBeCloseTo(0.79375, 12);
		// Just past it and into the length band.
		expect(evaluated(d11, plate, 'visual', { undercutDepth: 0.79376 }).missing).toContain(
			'undercutLength'
		);
	});

	// D1.1 undersize, L = 5/16 in, U = 1/8 in [2+]: 5/16 − 3/16 is not exactly 1/8 in floats.
	it('is within for a difference of two readings', () => {
		const f = finding(
			d11,
			{ kind: 'fillet', requiredSize: '5/16', weldLength: '10' },
			'visual',
			{ filletLeg1: '3/16', filletLeg2: '3/16', undersizeLength: '1' },
			'fillet.undersize'
		);
		expect(f.outcome).toBe('within');
	});
});

describe('units', () => {
	// D1.1 static undercut [2+]: 1/32 in in the inch column, 1 mm in the SI column.
	it('read bare numbers and pick the column of a dual-unit code by the project system', () => {
		expect(
			finding(d11, plate, 'visual', { undercutDepth: '1' }, 'undercut.depth', { units: 'metric' })
		).toMatchObject({
			measured: 1,
			limit: 1,
			outcome: 'within'
		});
		const imperial = evaluated(d11, plate, 'visual', { undercutDepth: '1 mm' });
		expect(imperial.missing).toContain('undercutLength');
	});

	it('default to imperial', () => {
		expect(
			finding(d11, plate, 'visual', { undercutDepth: '1/32' }, 'undercut.depth').measured
		).toBeCloseTo(inches(1 / 32), 12);
	});
});

describe('unreadable input', () => {
	it('is returned with the field it came from, and every error at once', () => {
		const result = evaluate(d11, { kind: 'butt', thickness: 'thick' }, 'visual', {
			undercutDepth: 'deep',
			crack: 'maybe',
			reinforcement: true,
			porosity: '-1/32'
		});
		expect(result.ok).toBe(false);
		if (result.ok) return;
		expect(result.errors).toEqual([
			{
				field: 'joint.thickness',
				message: 'Thickness: cannot read "thick"; type it like 3/32, 1-1/4 in, .375in or 2.5 mm'
			},
			{
				field: 'readings.undercutDepth',
				message: expect.stringMatching(/^Undercut depth: cannot read "deep"/)
			},
			{ field: 'readings.crack', message: 'Crack: answer yes or no' },
			{ field: 'readings.reinforcement', message: 'Reinforcement: expected a length, not yes/no' },
			{
				field: 'readings.porosity',
				message:
					'Porosity — sum of pore diameters in any 1 in (25 mm): cannot be negative ("-1/32")'
			}
		]);
	});

	it('covers the stage, the joint kind and the joint choices', () => {
		const badStage = evaluate(d11, plate, 'nde' as 'visual', {});
		expect(badStage.ok === false && badStage.errors[0].field).toBe('stage');
		const badKind = evaluate(d11, { kind: 'lap' as 'butt' }, 'visual', {});
		expect(badKind.ok === false && badKind.errors[0].field).toBe('joint.kind');
		const badMember = evaluate(d11, { kind: 'butt', member: 'main' as 'primary' }, 'visual', {});
		expect(badMember.ok === false && badMember.errors[0].field).toBe('joint.member');
	});

	it('refuses absurd readings and bare fractions in a metric project', () => {
		const absurd = evaluate(d11, plate, 'visual', { undercutDepth: '32' });
		expect(absurd.ok === false && absurd.errors[0].message).toMatch(/^Undercut depth: 32 in/);
		const fraction = evaluate(d11, plate, 'visual', { undercutDepth: '1/32' }, { units: 'metric' });
		expect(fraction.ok === false && fraction.errors).toEqual([
			{
				field: 'readings.undercutDepth',
				message: 'Undercut depth: "1/32" has no unit; type 1/32 in, or the value in mm'
			}
		]);
	});
});

describe('derived values', () => {
	// Reference §8, computed: unequal legs 1/4 × 3/8 in → throat 0.208 in.
	it('include the throat, size and undersize of a fillet', () => {
		const { derived } = evaluated(
			d11,
			{ kind: 'fillet', requiredSize: '5/16', weldLength: '24' },
			'visual',
			{
				filletLeg1: '1/4',
				filletLeg2: '3/8'
			}
		);
		expect((derived.theoreticalThroatMm ?? Number.NaN) / 25.4).toBeCloseTo(0.208, 3);
		expect(derived.filletSizeMm).toBeCloseTo(inches(1 / 4), 9);
		expect(derived.undersizeMm).toBeCloseTo(inches(1 / 16), 9);
		expect(derived.requiredSizeMm).toBeCloseTo(inches(5 / 16), 9);
		expect(derived.weldLengthMm).toBeCloseTo(inches(24), 9);
		expect(derived.legAsymmetryMm).toBeCloseTo(inches(1 / 8), 9);
	});

	it('take the wall reading when the joint has no thickness', () => {
		const result = evaluated(d11, { kind: 'butt' }, 'fitup', {
			wallThickness: '1/2',
			misalignment: '0.05 in'
		});
		expect(result.derived.thicknessMm).toBeCloseTo(inches(1 / 2), 9);
		expect(result.findings[0]).toMatchObject({ check: 'misalignment.max', outcome: 'within' });
		expect(result.findings[0].limit).toBeCloseTo(inches(0.05), 9);
	});
});

describe('deriveCriteriaSet', () => {
	// Common practice: an open-root pipe WPS often calls a 3/32 in gap, 1/16 to 1/8 in at fit-up.
	const projectApi = deriveCriteriaSet(api, {
		id: 'project-pipeline',
		name: 'Pipeline spec PL-01',
		overrides: {
			'rootOpening.range': {
				rule: { type: 'range', min: { in: 1 / 16, mm: 1.5 }, max: { in: 1 / 8, mm: 3 } },
				clause: 'PL-01 §4.2'
			}
		}
	});

	it('judges fit-up gaps against the project limits', () => {
		const gap = (rootOpening: string) =>
			finding(
				projectApi,
				{ kind: 'butt', thickness: '1/4 in' },
				'fitup',
				{ rootOpening },
				'rootOpening.range'
			);
		expect(gap('3/32').outcome).toBe('within');
		expect(gap('1/16').outcome).toBe('within');
		expect(gap('1/8').outcome).toBe('within');
		expect(gap('1/32').outcome).toBe('outside');
		expect(gap('5/32').outcome).toBe('outside');
		expect(gap('3/32')).toMatchObject({ clause: 'PL-01 §4.2', confidence: 'project' });
	});

	// AWS D1.1:2020 7.21.1 [2+]: the leg grows with a root opening over 1/16 in; a project that
	// tightens the rule keeps where it applies.
	it('keeps where a changed check applies, and the criteria of its base for indications', () => {
		const projectD11 = deriveCriteriaSet(d11, {
			id: 'project-structural',
			name: 'Structural spec ST-02',
			overrides: {
				'fillet.gapLeg': {
					rule: { type: 'min', min: { of: 'requiredSize', times: 1, plus: 2 } },
					clause: 'ST-02 §3.1'
				}
			}
		});
		expect(projectD11.limits['fillet.gapLeg']?.appliesOver).toEqual(
			d11.limits['fillet.gapLeg']?.appliesOver
		);
		const joint: JointInput = { kind: 'fillet', requiredSize: '1/4 in', thickness: '1/2 in' };
		const small = evaluated(projectD11, joint, 'visual', {
			filletLeg1: '1/4',
			filletLeg2: '1/4',
			rootOpening: '1/32'
		});
		expect(small.findings.some((f) => f.check === 'fillet.gapLeg')).toBe(false);
		expect(projectApi.volumetric).toBe(api.volumetric);
	});

	it('records its base, its version and what it changed', () => {
		expect(projectApi).toMatchObject({
			id: 'project-pipeline',
			name: 'Pipeline spec PL-01',
			standard: 'API Std 1104',
			edition: '21st edition (2013)',
			version: 1,
			basedOn: { id: 'api-1104', version: 1 },
			changed: ['rootOpening.range']
		});
		expect(projectApi.limits['undercut.depth']).toBe(api.limits['undercut.depth']);
		expect(api.limits['rootOpening.range']?.confidence).toBe('mem');
	});

	it('bumps the version when the project revises its own set, keeping its lineage', () => {
		const revised = deriveCriteriaSet(projectApi, {
			id: 'project-pipeline',
			name: 'Pipeline spec PL-01 rev B',
			overrides: { 'reinforcement.max': { rule: { type: 'max', max: { in: 1 / 8, mm: 3 } } } }
		});
		expect(revised.version).toBe(2);
		expect(revised.basedOn).toEqual({ id: 'api-1104', version: 1 });
		expect(revised.changed).toEqual(['rootOpening.range', 'reinforcement.max']);
		expect(revised.limits['reinforcement.max']?.clause).toBe(
			'project limit, replacing API Std 1104 7.8.2'
		);
		// A 3/32 in cap the base left to the inspector is within the project's 1/8 in.
		expect(
			finding(
				revised,
				{ kind: 'butt', thickness: '1/2 in' },
				'visual',
				{ reinforcement: '3/32' },
				'reinforcement.max'
			).outcome
		).toBe('within');
		expect(
			deriveCriteriaSet(revised, { id: 'project-pipeline', name: 'x', overrides: {}, version: 7 })
				.version
		).toBe(7);
	});

	it('survives storage as JSON', () => {
		const stored = JSON.parse(JSON.stringify(projectApi)) as CriteriaSet;
		const readings = { rootOpening: '1/32' };
		expect(evaluated(stored, { kind: 'butt' }, 'fitup', readings)).toEqual(
			evaluated(projectApi, { kind: 'butt' }, 'fitup', readings)
		);
	});

	it('refuses a built-in id, a blank name and an unknown check', () => {
		expect(() => deriveCriteriaSet(api, { id: 'api-1104', name: 'Mine', overrides: {} })).toThrow(
			CriteriaSetError
		);
		expect(() => deriveCriteriaSet(api, { id: 'mine', name: ' ', overrides: {} })).toThrow(
			/needs a name/
		);
		const unknown = { 'spatter.max': { rule: { type: 'absent' as const } } } as never;
		expect(() => deriveCriteriaSet(api, { id: 'mine', name: 'Mine', overrides: unknown })).toThrow(
			/Unknown check "spatter.max"/
		);
	});
});
