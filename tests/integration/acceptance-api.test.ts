/**
 * POST /api/acceptance/evaluate and GET /api/acceptance/criteria, called as SvelteKit calls them.
 * Each case names the source of the limit it relies on, as the engine's own tests do.
 */
import { describe, expect, it } from 'vitest';
import { POST } from '../../src/routes/api/acceptance/evaluate/+server';
import { GET } from '../../src/routes/api/acceptance/criteria/+server';
import { acceptanceNotice } from '$lib/acceptance';

type Handler = (event: never) => Response | Promise<Response>;

interface Finding {
	check: string;
	reading: string;
	measured: number;
	limit: number | null;
	unit: string;
	outcome: string;
	clause: string;
	note: string;
}

function post(body: unknown, raw?: string): Promise<Response> {
	const request = new Request('http://localhost/api/acceptance/evaluate', {
		method: 'POST',
		headers: { 'content-type': 'application/json' },
		body: raw ?? JSON.stringify(body)
	});
	return (POST as unknown as Handler)({ request } as never) as Promise<Response>;
}

async function evaluateBody(body: unknown) {
	const response = await post(body);
	const answer = await response.json();
	return { status: response.status, answer };
}

const findingOf = (answer: { findings: Finding[] }, check: string) =>
	answer.findings.find((finding) => finding.check === check);

const inches = (value: number) => value * 25.4;

const plate = {
	criteria: 'aws-d1.1-static',
	stage: 'visual',
	joint: { kind: 'butt', thickness: '3/4 in', stress: 'parallel' }
};

describe('POST /api/acceptance/evaluate', () => {
	// AWS D1.1:2020 Table 8.1 item 7 (undercut), statically loaded, under 1 in: 1/32 in at any length.
	it('is within for 1/32 in of undercut on a 3/4 in plate', async () => {
		const { status, answer } = await evaluateBody({
			...plate,
			readings: { undercutDepth: '1/32' }
		});
		expect(status).toBe(200);
		expect(answer.criteria).toMatchObject({
			id: 'aws-d1.1-static',
			name: 'AWS D1.1 statically loaded nontubular',
			edition: '2020'
		});
		expect(findingOf(answer, 'undercut.depth')).toMatchObject({
			reading: 'undercutDepth',
			unit: 'mm',
			outcome: 'within',
			clause: 'Table 8.1 (7)(A) undercut, statically loaded'
		});
		expect(findingOf(answer, 'undercut.depth')?.limit).toBeCloseTo(inches(1 / 32), 9);
		expect(answer.notice).toBe(acceptanceNotice);
	});

	// AWS D1.1:2020 Table 8.1 item 7, static, under 1 in: deeper than 1/32 in is allowed only up to
	// 1/16 in and only for an accumulated 2 in in any 12 in.
	it('is outside for 1/16 in of undercut over more than 2 in on a 3/4 in plate', async () => {
		const { status, answer } = await evaluateBody({
			...plate,
			readings: {
				undercutDepth: '1/16',
				undercutLength: '3 in',
				reinforcement: '1/16',
				porosity: 0,
				crack: false,
				overlap: false,
				craterUnfilled: false,
				incompleteFusion: false
			}
		});
		expect(status).toBe(200);
		expect(answer.verdict).toBe('outside');
		const length = findingOf(answer, 'undercut.length');
		expect(length).toMatchObject({ reading: 'undercutLength', outcome: 'outside' });
		expect(length?.limit).toBeCloseTo(inches(2), 9);
		expect(length?.clause).toBe('Table 8.1 (7)(A) undercut, statically loaded');
	});

	// Same clause: without the accumulated length the engine cannot tell, so it asks for it.
	it('asks for the undercut length when 1/16 in is given alone, and rejects 5/64 in', async () => {
		const alone = await evaluateBody({ ...plate, readings: { undercutDepth: '1/16' } });
		expect(alone.answer.verdict).toBe('judge');
		expect(alone.answer.missing).toContain('undercutLength');

		const deeper = await evaluateBody({ ...plate, readings: { undercutDepth: '5/64' } });
		expect(deeper.answer.verdict).toBe('outside');
		// The limit shown is the same for any depth: 1/32 in at any length, 1/16 in over a limited length.
		const depth = findingOf(deeper.answer, 'undercut.depth') as Finding & {
			band: { upTo: number };
		};
		expect(depth.limit).toBeCloseTo(inches(1 / 32), 9);
		expect(depth.band.upTo).toBeCloseTo(inches(1 / 16), 9);
	});

	// AWS D1.1:2020 Table 8.1 (crack prohibition): any crack is outside.
	it('reads yes/no flags and numbers in millimetres', async () => {
		const { answer } = await evaluateBody({
			...plate,
			readings: { crack: true, undercutDepth: 0.5 }
		});
		expect(answer.verdict).toBe('outside');
		expect(findingOf(answer, 'crack')).toMatchObject({ measured: 1, limit: 0, outcome: 'outside' });
		expect(findingOf(answer, 'undercut.depth')).toMatchObject({ measured: 0.5, outcome: 'within' });
	});

	// ASME B31.3-2018 Fig. 328.5.2C: about 1/16 in (1.5 mm) gap before welding a socket joint;
	// a pipe bottomed in the socket is refused (common practice).
	it('judges a B31.3 normal socket fit-up by its gap', async () => {
		const fitup = (rootOpening: string) =>
			evaluateBody({
				criteria: 'asme-b31.3-normal',
				stage: 'fitup',
				joint: { kind: 'socket', thickness: '0.154 in' },
				readings: { rootOpening }
			});
		const gapped = await fitup('1/16');
		expect(gapped.status).toBe(200);
		expect(gapped.answer.verdict).toBe('within');
		expect(findingOf(gapped.answer, 'socket.gap')).toMatchObject({
			outcome: 'within',
			clause: 'Fig. 328.5.2C'
		});
		expect((await fitup('0')).answer.verdict).toBe('outside');
	});

	// ASME B31.3-2018 328.4.2 and 328.4.3: bevel, root opening, root face and hi-lo are set by the
	// WPS and the engineering design, so a butt fit-up is for the inspector to judge.
	it('leaves a B31.3 normal butt fit-up to the WPS', async () => {
		const { status, answer } = await evaluateBody({
			criteria: 'asme-b31.3-normal',
			stage: 'fitup',
			joint: { kind: 'butt', thickness: '0.28 in' },
			readings: {
				rootOpening: '1/8',
				bevelAngle: '37-1/2°',
				rootFace: '1/16',
				misalignment: '1/32'
			}
		});
		expect(status).toBe(200);
		expect(answer.verdict).toBe('judge');
		expect(answer.missing).toEqual([]);
		expect(answer.findings.map((finding: Finding) => [finding.check, finding.clause])).toEqual([
			['rootOpening.range', '328.4.2'],
			['bevelAngle.range', '328.4.2'],
			['rootFace.range', '328.4.2'],
			['misalignment.max', '328.4.3']
		]);
		expect(findingOf(answer, 'bevelAngle.range')).toMatchObject({
			measured: 37.5,
			unit: 'deg',
			limit: null
		});
	});

	// ISO 5817:2014 level C, Table 1: 5011 undercut h ≤ 0.1t, max 0.5 mm (one source);
	// 502 excess weld metal h ≤ 1 + 0.15b, max 7 mm (two or more sources).
	it('reads bare numbers as millimetres in a metric ISO 5817-C butt weld', async () => {
		const iso = (readings: Record<string, string | boolean>) =>
			evaluateBody({
				criteria: 'iso-5817-c',
				stage: 'visual',
				units: 'metric',
				joint: { kind: 'butt', thickness: '10' },
				readings: { faceWidth: '14', ...readings }
			});
		const good = await iso({ undercutDepth: '0,5', reinforcement: '2 mm' });
		expect(good.status).toBe(200);
		expect(findingOf(good.answer, 'undercut.depth')).toMatchObject({
			measured: 0.5,
			limit: 0.5,
			outcome: 'within',
			clause: 'Table 1, 5011 / 5012 (undercut)'
		});
		expect(findingOf(good.answer, 'reinforcement.max')?.limit).toBeCloseTo(3.1, 9);
		expect(good.answer.derived.thicknessMm).toBe(10);

		const bad = await iso({ undercutDepth: '0.8', reinforcement: '4' });
		expect(bad.answer.verdict).toBe('outside');
		expect(findingOf(bad.answer, 'undercut.depth')?.outcome).toBe('outside');
		expect(findingOf(bad.answer, 'reinforcement.max')?.outcome).toBe('outside');
	});
});

describe('POST /api/acceptance/evaluate refuses', () => {
	it('an unreadable reading, naming it', async () => {
		const { status, answer } = await evaluateBody({
			...plate,
			readings: { undercutDepth: '3/8"x' }
		});
		expect(status).toBe(400);
		expect(answer.field).toBe('readings.undercutDepth');
		expect(answer.error).toMatch(/^Undercut depth: cannot read "3\/8"x"/);
	});

	it('an unknown criteria set, listing the known ones', async () => {
		const { status, answer } = await evaluateBody({ ...plate, criteria: 'aws-d1.1', readings: {} });
		expect(status).toBe(400);
		expect(answer.field).toBe('criteria');
		expect(answer.error).toMatch(/^Unknown criteria set "aws-d1.1"; use one of: aws-d1.1-static, /);
		expect(answer.error).toContain('iso-5817-d');
	});

	it('a body that is not JSON, or not an object', async () => {
		const broken = await post(undefined, '{ "criteria": "aws-d1.1-static", ');
		expect(broken.status).toBe(400);
		expect(await broken.json()).toMatchObject({ field: 'body', error: /^The body is not JSON/ });

		const list = await evaluateBody([plate]);
		expect(list.status).toBe(400);
		expect(list.answer.field).toBe('body');
	});

	it('a joint without its kind, or no joint at all', async () => {
		const noKind = await evaluateBody({ ...plate, joint: { thickness: '3/4 in' } });
		expect(noKind.status).toBe(400);
		expect(noKind.answer).toEqual({
			field: 'joint.kind',
			error: 'joint.kind: The joint kind must be one of butt, fillet, socket, branch.'
		});
		const noJoint = await evaluateBody({ criteria: 'aws-d1.1-static', stage: 'visual' });
		expect(noJoint.answer.field).toBe('joint');
	});

	it('a stage other than fitup, visual or nde, and nde without its method', async () => {
		const { status, answer } = await evaluateBody({ ...plate, stage: 'weld' });
		expect(status).toBe(400);
		expect(answer).toEqual({
			field: 'stage',
			error:
				'stage: The stage must be one of fitup, visual, or nde with the indications of an RT or UT report.'
		});
		const nde = await evaluateBody({ ...plate, stage: 'nde' });
		expect(nde.status).toBe(400);
		expect(nde.answer.field).toBe('method');
	});

	it('a reading the engine does not know, or a joint length it cannot read', async () => {
		const unknown = await evaluateBody({ ...plate, readings: { undercut: '1/32' } });
		expect(unknown.status).toBe(400);
		expect(unknown.answer.field).toBe('readings.undercut');

		const thickness = await evaluateBody({ ...plate, joint: { kind: 'butt', thickness: 'thick' } });
		expect(thickness.status).toBe(400);
		expect(thickness.answer.field).toBe('joint.thickness');
	});

	it('units other than imperial or metric', async () => {
		const { status, answer } = await evaluateBody({ ...plate, units: 'inches' });
		expect(status).toBe(400);
		expect(answer.field).toBe('units');
	});
});

describe('POST /api/acceptance/evaluate, readings only some codes judge', () => {
	const b313 = { criteria: 'asme-b31.3-normal', stage: 'visual' };
	const nps6 = { kind: 'butt', thickness: '0.280 in', diameter: '6.625 in' };

	// ASME B31.3-2018 Table 341.3.2 criterion B: incomplete penetration ≤ 1/32 in and ≤ 0.2Tw deep,
	// ≤ 1.5 in in any 6 in; criterion L for internal protrusion (Tw ≤ 1/2 in: 1/8 in).
	it('judges incomplete penetration and root protrusion of a B31.3 girth weld', async () => {
		const { status, answer } = await evaluateBody({
			...b313,
			joint: nps6,
			readings: {
				incompletePenetrationLength: '1-1/2 in',
				incompletePenetrationDepth: '1/32',
				rootProtrusion: '1/8'
			}
		});
		expect(status).toBe(200);
		expect(findingOf(answer, 'penetration.length')).toMatchObject({ outcome: 'within' });
		expect(findingOf(answer, 'penetration.depth')).toMatchObject({ outcome: 'within' });
		expect(findingOf(answer, 'rootProtrusion.max')).toMatchObject({ outcome: 'within' });
		expect(answer.derived.girthLengthMm).toBeCloseTo(Math.PI * inches(6.625), 9);

		const deep = await evaluateBody({
			...b313,
			joint: nps6,
			readings: { incompletePenetrationLength: '1/2', incompletePenetrationDepth: '3/64' }
		});
		expect(deep.answer.verdict).toBe('outside');
	});

	// AWS D1.1:2020 Table 8.1 (8)(B) [1]: at most one pore in 4 in of a cyclically loaded fillet.
	it('counts pores, and refuses a count that is no whole number', async () => {
		const cyclic = {
			criteria: 'aws-d1.1-cyclic',
			stage: 'visual',
			joint: { kind: 'fillet', thickness: '1/2 in', requiredSize: '1/4 in' }
		};
		const two = await evaluateBody({ ...cyclic, readings: { poreLargest: '1/16', poreCount: 2 } });
		expect(findingOf(two.answer, 'pore.count')).toMatchObject({
			measured: 2,
			limit: 1,
			unit: 'count',
			outcome: 'outside'
		});
		const half = await evaluateBody({ ...cyclic, readings: { poreCount: '1.5' } });
		expect(half.status).toBe(400);
		expect(half.answer).toEqual({
			field: 'readings.poreCount',
			error: 'Pores — number in any 4 in (100 mm): give a whole number, such as 0, 1 or 3'
		});
	});

	// ASME B31.3-2018 Table 341.3.2 criterion J: Ra ≤ 500 µin under severe cyclic conditions.
	it('reads a surface roughness in µin or µm, and names an unreadable one', async () => {
		const severe = { criteria: 'asme-b31.3-severe-cyclic', stage: 'visual', joint: nps6 };
		const rough = await evaluateBody({ ...severe, readings: { surfaceRoughness: '600 µin' } });
		expect(findingOf(rough.answer, 'surfaceFinish.max')).toMatchObject({
			unit: 'um',
			outcome: 'outside'
		});
		const bad = await evaluateBody({ ...severe, readings: { surfaceRoughness: 'rough' } });
		expect(bad.status).toBe(400);
		expect(bad.answer.field).toBe('readings.surfaceRoughness');
	});

	// ISO 5817:2014 507 (unconfirmed), level C, t = 7.3 mm: plates 1.095 mm, girth welds 3 mm.
	it('gives the hi-lo limit of the joint it is told of, and both where it is not told', async () => {
		const iso = { criteria: 'iso-5817-c', stage: 'fitup', units: 'metric' };
		const unknown = await evaluateBody({
			...iso,
			joint: { kind: 'butt', thickness: 7.3 },
			readings: { misalignment: 2.5 }
		});
		const misalignment = findingOf(unknown.answer, 'misalignment.max') as Finding & {
			bounds: { min: number; max: number };
		};
		expect(misalignment).toMatchObject({ limit: null, outcome: 'judge', bounds: { max: 3 } });
		expect(misalignment.bounds.min).toBeCloseTo(1.095, 9);
		const girth = await evaluateBody({
			...iso,
			joint: { kind: 'butt', thickness: 7.3, seam: 'circumferential' },
			readings: { misalignment: 2.5 }
		});
		expect(findingOf(girth.answer, 'misalignment.max')).toMatchObject({
			limit: 3,
			outcome: 'within'
		});
		const bad = await evaluateBody({
			...iso,
			joint: { kind: 'butt', thickness: 7.3, seam: 'spiral' }
		});
		expect(bad.status).toBe(400);
		expect(bad.answer.field).toBe('joint.seam');
	});
});

describe('POST /api/acceptance/evaluate, indications of an RT report', () => {
	const rt = {
		criteria: 'api-1104',
		stage: 'nde',
		method: 'RT',
		joint: { kind: 'butt', thickness: '0.375 in', diameter: '12.75 in' }
	};

	// API 1104 21st ed. 9.3.1: an IP indication longer than 1 in (25 mm) is a defect.
	it('judges each indication by the set and names the caution', async () => {
		const { status, answer } = await evaluateBody({
			...rt,
			indications: [{ type: 'incompletePenetration', length: '1-1/16 in', position: '3 in' }]
		});
		expect(status).toBe(200);
		expect(answer).toMatchObject({ verdict: 'outside', method: 'RT', notice: acceptanceNotice });
		expect(findingOf(answer, 'nde.incompletePenetration.length')).toMatchObject({
			outcome: 'outside',
			clause: '9.3.1 (inadequate penetration without high-low, IP)'
		});
		const clean = await evaluateBody({ ...rt, indications: [] });
		expect(clean.answer).toMatchObject({ verdict: 'within', findings: [] });
	});

	it('refuses an indication it cannot read, naming it, and MT', async () => {
		const bad = await evaluateBody({
			...rt,
			indications: [{ type: 'incompletePenetration', length: 'long' }]
		});
		expect(bad.status).toBe(400);
		expect(bad.answer.field).toBe('indications.0.length');
		const kind = await evaluateBody({ ...rt, indications: [{ type: 'wormhole' }] });
		expect(kind.status).toBe(400);
		expect(kind.answer.field).toBe('indications.0.type');
		const mt = await evaluateBody({ ...rt, method: 'MT' });
		expect(mt.status).toBe(400);
		expect(mt.answer.field).toBe('method');
	});
});

describe('GET /api/acceptance/criteria', () => {
	it('lists all ten built-in sets, each limit with its clause and how sure we are of it', async () => {
		const response = await (GET as unknown as Handler)({} as never);
		expect(response.status).toBe(200);
		const { items, notice } = await response.json();
		expect(notice).toBe(acceptanceNotice);
		expect(items.map((set: { id: string }) => set.id)).toEqual([
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
		for (const set of items) {
			expect(set, set.id).toMatchObject({
				name: expect.any(String),
				standard: expect.any(String),
				edition: expect.stringMatching(/\d{4}/),
				version: 1
			});
			expect(set.limits.length, set.id).toBeGreaterThan(0);
			for (const limit of set.limits) {
				expect(limit.clause, `${set.id} ${limit.check}`).not.toBe('');
				expect(['2+', '1', 'mem', 'practice', 'project']).toContain(limit.confidence);
				expect(limit).toHaveProperty('note');
				expect(limit.kinds.length).toBeGreaterThan(0);
			}
		}
		// AWS D1.1:2020 Table 8.1 (undercut), statically loaded, rests on two or more sources.
		const undercut = items[0].limits.find(
			(limit: { check: string }) => limit.check === 'undercut.depth'
		);
		expect(undercut).toMatchObject({
			clause: 'Table 8.1 (7)(A) undercut, statically loaded',
			confidence: '2+',
			stages: ['visual']
		});
	});
});
