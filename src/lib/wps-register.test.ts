/**
 * The WPS register's rules. The procedures are invented; the ranges they test follow how a WPS
 * states them (ASME BPVC Section IX QW-200.1: base metals by P-number, thickness and diameter
 * ranges qualified, joint design, preheat and interpass, filler classes, supporting PQRs).
 */
import { describe, expect, it } from 'vitest';
import {
	emptyWps,
	jointDesign,
	materialGroup,
	parseTemperature,
	rangeFlags,
	readWps,
	typedOf,
	unlistedProcesses,
	type WpsTyped
} from './wps-register';

const typed = (fields: Partial<WpsTyped>): WpsTyped => ({
	...emptyWps(),
	number: 'WPS-T-01',
	revision: '2',
	processes: 'GTAW/SMAW',
	...fields
});

function read(fields: Partial<WpsTyped>, units: 'imperial' | 'metric' = 'metric') {
	const result = readWps(typed(fields), units);
	if (!result.ok) throw new Error(result.problems.map((p) => p.message).join('; '));
	return result.record;
}

describe('reading a WPS as typed', () => {
	it('reads ranges in the project units, keeping the text as typed', () => {
		const record = read(
			{
				thicknessMin: '3/16',
				thicknessMax: '1-1/2',
				diameterMin: '2',
				rootOpeningMin: '1/16',
				rootOpeningMax: '1/8',
				bevelAngleMin: '35',
				bevelAngleMax: '40°',
				preheatMin: '50',
				materialGroups: 'P-No. 1; p8'
			},
			'imperial'
		);
		// 1 in = 25.4 mm exactly (NIST SP 811, B.8).
		expect(record.ranges.thickness?.min?.text).toBe('3/16');
		expect(record.ranges.thickness?.min?.value).toBeCloseTo(4.7625, 6);
		expect(record.ranges.thickness?.max?.value).toBeCloseTo(38.1, 6);
		expect(record.ranges.diameter).toEqual({ min: { value: 50.8, text: '2' }, max: null });
		expect(record.ranges.rootOpening?.max?.value).toBeCloseTo(3.175, 6);
		expect(record.ranges.bevelAngle).toEqual({
			min: { value: 35, text: '35' },
			max: { value: 40, text: '40°' }
		});
		// 50 °F = 10 °C (°C = (°F − 32) × 5/9).
		expect(record.preheatMin).toEqual({ celsius: 10, text: '50' });
		expect(record.processes).toEqual(['GTAW', 'SMAW']);
		expect(record.materialGroups).toEqual(['P1', 'P8']);
		expect(record.status).toBe('draft');
	});

	it('reads ISO 4063 process numbers as the letters welders are qualified by', () => {
		expect(read({ processes: '141/111' }).processes).toEqual(['GTAW', 'SMAW']);
	});

	it('names every field it cannot read', () => {
		const result = readWps(
			typed({
				number: '',
				processes: 'TIGGY2',
				rootOpeningMin: '3',
				bevelAngleMin: '40',
				bevelAngleMax: '30',
				preheatMin: 'warm',
				status: 'pending'
			}),
			'metric'
		);
		expect(result.ok).toBe(false);
		if (result.ok) return;
		expect(result.problems.map((p) => p.field).sort()).toEqual(
			['bevelAngleMin', 'number', 'preheatMin', 'processes', 'rootOpeningMax', 'status'].sort()
		);
	});

	it('refuses an interpass maximum below the preheat minimum', () => {
		const result = readWps(typed({ preheatMin: '150 °C', interpassMax: '100 °C' }), 'metric');
		expect(result.ok).toBe(false);
	});

	it('writes a record back as it was typed', () => {
		const fields = typed({ thicknessMin: '3 mm', thicknessMax: '20', pqrs: 'PQR-1; PQR-2' });
		const back = typedOf(read(fields));
		expect(back.thicknessMin).toBe('3 mm');
		expect(back.thicknessMax).toBe('20');
		expect(back.pqrs).toBe('PQR-1; PQR-2');
		expect(back.processes).toBe('GTAW, SMAW');
	});

	it('reads temperatures in either scale', () => {
		// 212 °F = 100 °C.
		expect(parseTemperature('212 °F', 'metric')).toEqual({
			ok: true,
			value: { celsius: 100, text: '212 °F' }
		});
		expect(parseTemperature('10', 'metric')).toMatchObject({ ok: true, value: { celsius: 10 } });
		expect(parseTemperature('hot', 'metric').ok).toBe(false);
	});
});

describe('the joint design the engine judges', () => {
	it('gives only the dimensions with both ends', () => {
		const record = read({
			rootOpeningMin: '2',
			rootOpeningMax: '4',
			bevelAngleMin: '30',
			bevelAngleMax: '35'
		});
		expect(jointDesign(record)).toEqual({
			number: 'WPS-T-01',
			revision: '2',
			rootOpening: { min: 2, max: 4 },
			bevelAngle: { min: 30, max: 35 }
		});
	});
});

describe('range flags', () => {
	const wps = read({
		thicknessMin: '3',
		thicknessMax: '20',
		diameterMin: '25',
		materialGroups: '1.1'
	});
	const joint = { thicknessMm: 7.11, diameterMm: 168.3, material: 'P265GH' };

	it('flags nothing for a joint inside every range', () => {
		expect(rangeFlags(wps, joint, 'metric')).toEqual([]);
	});

	it.each([
		[{ thicknessMm: 2.9 }, 'thickness'],
		[{ thicknessMm: 20.1 }, 'thickness'],
		[{ diameterMm: 21.3 }, 'diameter'],
		// ISO/TR 15608:2017 Table 1: S355 (ReH over 275 up to 360 MPa) is group 1.2.
		[{ material: 'S355J2' }, 'material']
	] as const)('flags %o as %s', (change, field) => {
		const flags = rangeFlags(wps, { ...joint, ...change }, 'metric');
		expect(flags.map((f) => f.field)).toEqual([field]);
		expect(flags[0].message).toContain('WPS WPS-T-01 rev 2');
	});

	it('does not flag the ends themselves', () => {
		expect(rangeFlags(wps, { ...joint, thicknessMm: 3 }, 'metric')).toEqual([]);
		expect(rangeFlags(wps, { ...joint, thicknessMm: 20 }, 'metric')).toEqual([]);
	});

	it('does not flag a value the joint does not give, or a material of no known group', () => {
		expect(
			rangeFlags(wps, { thicknessMm: null, diameterMm: null, material: 'Duplex X' }, 'metric')
		).toEqual([]);
	});

	// ASME BPVC Section IX QW/QB-422: A106 Gr B is P-No. 1; A312 TP316L is P-No. 8.
	it('places common specifications in their group', () => {
		expect(materialGroup('ASTM A106 Gr B')).toBe('P1');
		expect(materialGroup('A312 TP316L')).toBe('P8');
		expect(materialGroup('P-No. 8')).toBe('P8');
		expect(materialGroup('P265GH')).toBe('1.1');
	});
});

describe('processes of a weld against the WPS', () => {
	it('lists the processes the WPS does not', () => {
		const wps = { processes: ['GTAW', 'SMAW'] };
		expect(unlistedProcesses(wps, ['GTAW', 'SMAW'])).toEqual([]);
		expect(unlistedProcesses(wps, ['GTAW', 'FCAW'])).toEqual(['FCAW']);
		expect(unlistedProcesses({ processes: ['FCAW'] }, ['FCAW-G'])).toEqual([]);
	});
});
