/**
 * The editor's draft: limits typed in the project's units reach the engine in mm and degrees,
 * and a stored set types back to exactly what it holds. Base: ASME B31.3-2018 Table 341.3.2
 * criterion H (undercut ≤ 1 mm (1/32 in) and ≤ Tw/4); the project clauses are invented.
 */
import { describe, expect, it } from 'vitest';
import { deriveCriteriaSet, getCriteriaSet, type CriteriaSet } from '$lib/acceptance';
import { criteriaSetSchema, readOverrides } from '$lib/schemas/criteria-set';
import { newDraft, requestBody, revisionDraft } from './criteria-draft';

const b313 = getCriteriaSet('asme-b31.3-normal') as CriteriaSet;

function read(overrides: Record<string, unknown>, units: 'imperial' | 'metric') {
	const parsed = criteriaSetSchema.parse({ id: 'ps-1', name: 'PS-1', base: b313.id, overrides });
	return readOverrides(parsed.overrides, units);
}

describe('readOverrides', () => {
	it('reads a bare number in the project unit and a number as millimetres', () => {
		const imperial = read(
			{ 'undercut.depth': { type: 'max', max: '1/64', clause: 'PS §1' } },
			'imperial'
		);
		expect(imperial.ok && imperial.overrides['undercut.depth']).toEqual({
			rule: { type: 'max', max: 25.4 / 64 },
			clause: 'PS §1'
		});
		const metric = read(
			{ 'undercut.depth': { type: 'max', max: '0.5', clause: 'PS §1' } },
			'metric'
		);
		expect(metric.ok && metric.overrides['undercut.depth']?.rule).toEqual({
			type: 'max',
			max: 0.5
		});
		const number = read(
			{ 'undercut.depth': { type: 'max', max: 0.4, clause: 'PS §1' } },
			'imperial'
		);
		expect(number.ok && number.overrides['undercut.depth']?.rule).toEqual({
			type: 'max',
			max: 0.4
		});
	});

	// Common practice: an open-root groove is often bevelled 30° to 40° per side.
	it('reads angles in degrees, and ranges the right way round', () => {
		const bevel = read(
			{ 'bevelAngle.range': { type: 'range', min: '30', max: '40°', clause: 'PS §2' } },
			'imperial'
		);
		expect(bevel.ok && bevel.overrides['bevelAngle.range']?.rule).toEqual({
			type: 'range',
			min: 30,
			max: 40
		});
		const upsideDown = read(
			{ 'bevelAngle.range': { type: 'range', min: '40', max: '30', clause: 'PS §2' } },
			'imperial'
		);
		expect(upsideDown).toMatchObject({ ok: false, field: 'overrides.bevelAngle.range.max' });
	});

	it('reads a banded limit with its length, and refuses what cannot be read', () => {
		const banded = read(
			{
				'undercut.depth': {
					type: 'banded',
					max: '1/64',
					bandUpTo: '1/32',
					bandLength: '2',
					clause: 'PS §3'
				}
			},
			'imperial'
		);
		expect(banded.ok && banded.overrides['undercut.depth']?.rule).toEqual({
			type: 'banded',
			max: 25.4 / 64,
			band: { upTo: 25.4 / 32, length: { max: 50.8 } }
		});
		expect(
			read({ 'undercut.depth': { type: 'max', max: '1/64', clause: 'PS §3' } }, 'metric')
		).toMatchObject({ ok: false, field: 'overrides.undercut.depth.max' });
		expect(read({ 'undercut.depth': { type: 'max', clause: 'PS §3' } }, 'metric')).toMatchObject({
			ok: false,
			field: 'overrides.undercut.depth.max'
		});
		expect(
			read({ 'porosity.max': { type: 'banded', max: '0', clause: 'PS §3' } }, 'metric')
		).toMatchObject({ ok: false, field: 'overrides.porosity.max.type' });
	});
});

describe('the draft', () => {
	it('starts with nothing changed and the base rule offered', () => {
		const draft = newDraft(b313);
		expect(draft.limits['undercut.depth']).toMatchObject({ changed: false, type: 'banded' });
		expect(requestBody(draft)).toEqual({ id: '', name: '', base: b313.id, overrides: {} });
	});

	it('types a stored version back so that saving it again changes nothing', () => {
		const overrides = {
			'undercut.depth': { rule: { type: 'max' as const, max: 25.4 / 64 }, clause: 'PS §1' },
			'reinforcement.max': {
				rule: { type: 'max' as const, max: 0.5, beyond: 'judge' as const },
				clause: 'PS §4',
				note: 'cap ground flush'
			}
		};
		const set = deriveCriteriaSet(b313, { id: 'ps-1', name: 'PS-1', overrides, version: 3 });
		const draft = revisionDraft(set, b313, 'imperial');
		expect(draft.limits['undercut.depth']).toMatchObject({ changed: true, max: '1/64 in' });
		expect(draft.limits['reinforcement.max']).toMatchObject({
			max: '0.5 mm',
			inspectorJudges: true
		});
		const body = requestBody(draft);
		expect(body).toMatchObject({ id: 'ps-1', revises: 3 });
		const parsed = criteriaSetSchema.parse(body);
		expect(readOverrides(parsed.overrides, 'imperial')).toEqual({ ok: true, overrides });
	});
});
