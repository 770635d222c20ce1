/**
 * The demo job: an invented owner, contractor and plant, two projects (one in inches, one
 * in millimetres), their drawings, welders and people. Nothing here describes a real
 * company, person or drawing.
 */
import type { DemoSheetSpec } from './sheets';
import type { WpsTyped } from '../../wps-register';
import type { ProjectRole, UnitSystem } from '../db/schema';

export const DEMO_PASSWORD = 'tacksheet-demo';

export interface DemoUser {
	email: string;
	name: string;
	isAdmin?: boolean;
	role?: ProjectRole;
	/** Project codes this person belongs to; all demo projects when absent. */
	projects?: string[];
}

export const DEMO_USERS: DemoUser[] = [
	{ email: 'admin@tacksheet.test', name: 'Alex Marwood (QC manager)', isAdmin: true },
	{ email: 'doccon@tacksheet.test', name: 'Dana Pereira-Holt', role: 'doc_controller' },
	{ email: 'inspector@tacksheet.test', name: 'Ines Varga', role: 'inspector' },
	// Works on the Larchmere job only, so the demo shows what a non-member sees.
	{
		email: 'inspector2@tacksheet.test',
		name: 'Olu Brennagh',
		role: 'inspector',
		projects: ['LBM-20']
	},
	{ email: 'foreman@tacksheet.test', name: 'Frank Delacourt', role: 'foreman' },
	{ email: 'turnover@tacksheet.test', name: 'Tess Okafor-Lind', role: 'turnover' },
	{ email: 'viewer@tacksheet.test', name: 'Vic Hallam (client inspector)', role: 'viewer' }
];

export interface DemoWelder {
	stamp: string;
	name: string;
	employer: string;
	processes: { process: string; qualifiedOn: string; lastUsedOn: string; reference: string }[];
}

export interface DemoDrawing {
	number: string;
	title: string;
	kind: DemoSheetSpec['kind'];
	line: string;
	area: string;
	system: string;
	criteriaSetId: string;
	wps: string;
	material: string;
	/** RT on every joint of this line (severe service), else by sampling only. */
	ndeRequired: string;
	/** One spec per revision, oldest first; the last one is current. */
	revisions: Omit<
		DemoSheetSpec,
		'party' | 'units' | 'number' | 'title' | 'kind' | 'area' | 'system'
	>[];
}

export interface DemoProject {
	code: string;
	name: string;
	client: string;
	contractor: string;
	site: string;
	units: UnitSystem;
	defaultCriteriaSet: string;
	drawings: DemoDrawing[];
	welders: DemoWelder[];
	/** The project's WPS register, as typed on its form (invented procedures). */
	wpsRegister: Partial<WpsTyped>[];
}

/** What the sheet generator needs to draw one revision of a demo drawing (optionally reseeded). */
export function demoSheetSpec(
	project: DemoProject,
	drawing: DemoDrawing,
	revision: DemoDrawing['revisions'][number],
	seed = revision.seed
): DemoSheetSpec {
	return {
		...revision,
		seed,
		kind: drawing.kind,
		number: drawing.number,
		title: drawing.title,
		area: drawing.area,
		system: drawing.system,
		units: project.units,
		party: {
			owner: project.client,
			contractor: project.contractor,
			plant: project.site,
			projectCode: project.code,
			projectName: project.name
		}
	};
}

const carbonSteel = 'ASTM A106 Gr B';
const pipeWps = 'WPS-CS-01 GTAW/SMAW';

function iso(
	number: string,
	title: string,
	line: { lineNumber: string; nps: string; schedule: string; service: string },
	area: string,
	system: string,
	seed: number,
	weldCount: number,
	extra: Partial<DemoDrawing['revisions'][number]> = {}
): DemoDrawing {
	return {
		number,
		title,
		kind: 'isometric',
		line: line.lineNumber,
		area,
		system,
		criteriaSetId: 'asme-b31.3-normal',
		wps: pipeWps,
		material: carbonSteel,
		ndeRequired: '',
		revisions: [
			{
				revision: '0',
				revisionDate: '2026-09-14',
				revisionHistory: [
					{ label: '0', date: '2026-09-14', description: 'Issued for construction' }
				],
				paper: 'ANSI-B',
				line: { ...line, material: carbonSteel },
				seed,
				weldCount,
				...extra
			}
		]
	};
}

export const LARCHMERE: DemoProject = {
	code: 'LBM-20',
	name: 'Larchmere Bio-Methanol, Unit 20 synthesis loop',
	client: 'Larchmere Process Holdings',
	contractor: 'Brightwater Piping & Steel',
	site: 'Larchmere Works, Bay 4',
	units: 'imperial',
	defaultCriteriaSet: 'asme-b31.3-normal',
	wpsRegister: [
		{
			number: 'WPS-CS-01',
			revision: '0',
			status: 'superseded',
			title: 'Carbon steel pipe, open root',
			processes: 'GTAW/SMAW',
			materialGroups: 'P1',
			thicknessMin: '3/16',
			thicknessMax: '3/4',
			diameterMin: '2',
			grooveType: 'Single-V',
			rootOpeningMin: '3/32',
			rootOpeningMax: '1/8',
			rootFaceMin: '1/32',
			rootFaceMax: '1/16',
			bevelAngleMin: '35',
			bevelAngleMax: '40',
			preheatMin: '50',
			interpassMax: '600',
			fillerClasses: 'ER70S-2; E7018',
			pqrs: 'PQR-CS-101'
		},
		{
			number: 'WPS-CS-01',
			revision: '1',
			status: 'approved',
			title: 'Carbon steel pipe, open root',
			processes: 'GTAW/SMAW',
			materialGroups: 'P1',
			thicknessMin: '1/8',
			thicknessMax: '1-1/2',
			diameterMin: '2',
			grooveType: 'Single-V',
			rootOpeningMin: '1/16',
			rootOpeningMax: '1/8',
			rootFaceMin: '1/32',
			rootFaceMax: '3/32',
			bevelAngleMin: '35',
			bevelAngleMax: '40',
			preheatMin: '50',
			interpassMax: '600',
			fillerClasses: 'ER70S-2; E7018',
			pqrs: 'PQR-CS-101; PQR-CS-104'
		},
		{
			number: 'WPS-ST-04',
			revision: '0',
			status: 'approved',
			title: 'Structural steel, fillet and groove, gas-shielded flux core',
			processes: 'FCAW',
			materialGroups: 'P1',
			thicknessMin: '1/8',
			thicknessMax: '2',
			grooveType: 'Fillet; single-bevel CJP',
			preheatMin: '50',
			interpassMax: '550',
			fillerClasses: 'E71T-1C',
			pqrs: 'PQR-ST-11'
		}
	],
	welders: [
		{
			stamp: 'B14',
			name: 'Dario Quennell',
			employer: 'Brightwater Piping & Steel',
			processes: [
				{
					process: 'GTAW',
					qualifiedOn: '2025-03-10',
					lastUsedOn: '2026-11-20',
					reference: 'WPQ-B14-01'
				},
				{
					process: 'SMAW',
					qualifiedOn: '2025-03-10',
					lastUsedOn: '2026-11-20',
					reference: 'WPQ-B14-02'
				}
			]
		},
		{
			stamp: 'B22',
			name: 'Mira Oduya-Fenn',
			employer: 'Brightwater Piping & Steel',
			processes: [
				{
					process: 'GTAW',
					qualifiedOn: '2024-11-02',
					lastUsedOn: '2026-11-24',
					reference: 'WPQ-B22-01'
				},
				{
					process: 'SMAW',
					qualifiedOn: '2024-11-02',
					lastUsedOn: '2026-11-24',
					reference: 'WPQ-B22-02'
				}
			]
		},
		{
			stamp: 'B31',
			name: 'Tomas Ekwall',
			employer: 'Brightwater Piping & Steel',
			processes: [
				{
					process: 'GTAW',
					qualifiedOn: '2025-06-18',
					lastUsedOn: '2026-11-18',
					reference: 'WPQ-B31-01'
				},
				// Continuity runs out in December: shows on the lapsing list.
				{
					process: 'SMAW',
					qualifiedOn: '2025-06-18',
					lastUsedOn: '2026-06-12',
					reference: 'WPQ-B31-02'
				}
			]
		},
		{
			stamp: 'B47',
			name: 'Ruth Pallister',
			employer: 'Coldharbour Weld Services',
			processes: [
				{
					process: 'GTAW',
					qualifiedOn: '2026-02-02',
					lastUsedOn: '2026-11-25',
					reference: 'WPQ-B47-01'
				},
				{
					process: 'SMAW',
					qualifiedOn: '2026-02-02',
					lastUsedOn: '2026-11-25',
					reference: 'WPQ-B47-02'
				}
			]
		},
		{
			stamp: 'S08',
			name: 'Ivo Brandlee',
			employer: 'Brightwater Piping & Steel',
			processes: [
				{
					process: 'FCAW',
					qualifiedOn: '2025-09-01',
					lastUsedOn: '2026-11-21',
					reference: 'WPQ-S08-01'
				}
			]
		}
	],
	drawings: [
		{
			...iso(
				'LBM-20-ISO-1101',
				'Syngas feed to reactor R-2001',
				{ lineNumber: '6"-SG-2001-A1A', nps: '6', schedule: 'SCH 40', service: 'Syngas' },
				'Area 20',
				'TP-20-01',
				1101,
				14
			),
			revisions: [
				{
					revision: '0',
					revisionDate: '2026-09-14',
					revisionHistory: [
						{ label: '0', date: '2026-09-14', description: 'Issued for construction' }
					],
					paper: 'ANSI-B',
					line: {
						lineNumber: '6"-SG-2001-A1A',
						nps: '6',
						schedule: 'SCH 40',
						service: 'Syngas',
						material: carbonSteel
					},
					seed: 1101,
					weldCount: 14
				},
				{
					revision: '1',
					revisionDate: '2026-11-02',
					revisionHistory: [
						{ label: '0', date: '2026-09-14', description: 'Issued for construction' },
						{
							label: '1',
							date: '2026-11-02',
							description: 'Re-routed at rack crossing, drain added'
						}
					],
					paper: 'ANSI-B',
					line: {
						lineNumber: '6"-SG-2001-A1A',
						nps: '6',
						schedule: 'SCH 40',
						service: 'Syngas',
						material: carbonSteel
					},
					seed: 1101,
					weldCount: 14,
					variant: 1
				}
			]
		},
		iso(
			'LBM-20-ISO-1102',
			'Reactor effluent to cooler E-2003, with bypass',
			{ lineNumber: '8"-PE-2004-A1A', nps: '8', schedule: 'SCH 40', service: 'Reactor effluent' },
			'Area 20',
			'TP-20-01',
			1102,
			24,
			{ sheets: 2 }
		),
		iso(
			'LBM-20-ISO-1103',
			'Cooling water return from E-2003',
			{ lineNumber: '4"-CW-2011-B2A', nps: '4', schedule: 'STD', service: 'Cooling water return' },
			'Area 20',
			'TP-20-02',
			1103,
			12,
			{ rotate: 90 }
		),
		iso(
			'LBM-20-ISO-1104',
			'Crude methanol rundown to day tank T-2101',
			{ lineNumber: '3"-ME-2101-A1A', nps: '3', schedule: 'SCH 40', service: 'Crude methanol' },
			'Area 21',
			'TP-21-01',
			1104,
			13
		),
		iso(
			'LBM-20-ISO-1105',
			'Low-pressure steam condensate header',
			{ lineNumber: '2"-SC-2120-A1A', nps: '2', schedule: 'SCH 80', service: 'Steam condensate' },
			'Area 21',
			'TP-21-02',
			1105,
			11
		),
		{
			number: 'LBM-20-SP-1102-03',
			title: 'Spool 1102-03, effluent bypass',
			kind: 'shop',
			line: '8"-PE-2004-A1A',
			area: 'Area 20',
			system: 'TP-20-01',
			criteriaSetId: 'asme-b31.3-normal',
			wps: pipeWps,
			material: carbonSteel,
			ndeRequired: '',
			revisions: [
				{
					revision: '0',
					revisionDate: '2026-09-21',
					revisionHistory: [
						{ label: '0', date: '2026-09-21', description: 'Issued for fabrication' }
					],
					paper: 'ANSI-B',
					line: {
						lineNumber: '8"-PE-2004-A1A',
						nps: '8',
						schedule: 'SCH 40',
						service: 'Reactor effluent',
						material: carbonSteel
					},
					seed: 1106,
					weldCount: 8
				}
			]
		},
		{
			number: 'LBM-20-STR-2001',
			title: 'Pipe rack PR-2, bent 3, main beam B3-1',
			kind: 'structural',
			line: '',
			area: 'Area 20',
			system: 'PR-2',
			criteriaSetId: 'aws-d1.1-static',
			wps: 'WPS-ST-04 FCAW',
			material: 'ASTM A992',
			ndeRequired: '',
			revisions: [
				{
					revision: 'A',
					revisionDate: '2026-08-30',
					revisionHistory: [
						{ label: 'A', date: '2026-08-30', description: 'Issued for fabrication' }
					],
					paper: 'ANSI-D',
					seed: 2001,
					weldCount: 16
				}
			]
		}
	]
};

const metricPipe = 'P265GH';
const metricWps = 'WPS-VFT-02 141/111';

function metricIso(
	number: string,
	title: string,
	line: { lineNumber: string; nps: string; schedule: string; service: string },
	area: string,
	system: string,
	seed: number,
	weldCount: number
): DemoDrawing {
	return {
		number,
		title,
		kind: 'isometric',
		line: line.lineNumber,
		area,
		system,
		criteriaSetId: 'iso-5817-c',
		wps: metricWps,
		material: metricPipe,
		ndeRequired: '',
		revisions: [
			{
				revision: 'B',
				revisionDate: '2026-10-05',
				revisionHistory: [
					{ label: 'A', date: '2026-08-17', description: 'Issued for review' },
					{ label: 'B', date: '2026-10-05', description: 'Issued for construction' }
				],
				paper: 'A3',
				line: { ...line, material: metricPipe },
				seed,
				weldCount
			}
		]
	};
}

export const VELLMAR: DemoProject = {
	code: 'VFT-3',
	name: 'Vellmar Fjord Terminal, tank farm 3 transfer lines',
	client: 'Vellmar Havn Energi',
	contractor: 'Nordlys Rør og Stål',
	site: 'Vellmar Fjord Terminal, tank farm 3',
	units: 'metric',
	defaultCriteriaSet: 'iso-5817-c',
	wpsRegister: [
		{
			number: 'WPS-VFT-02',
			revision: '3',
			status: 'approved',
			title: 'Non-alloy pipe, TIG root, MMA fill and cap',
			processes: '141/111',
			materialGroups: '1.1',
			thicknessMin: '3 mm',
			thicknessMax: '20 mm',
			diameterMin: '25 mm',
			grooveType: 'Single-V',
			rootOpeningMin: '2',
			rootOpeningMax: '4',
			rootFaceMin: '1',
			rootFaceMax: '2',
			bevelAngleMin: '30',
			bevelAngleMax: '35',
			preheatMin: '10',
			interpassMax: '250',
			fillerClasses: 'W 42 5 W3Si1; E 42 4 B 32 H5',
			pqrs: 'PQR-N-0412'
		},
		{
			number: 'WPS-VFT-07',
			revision: '1',
			status: 'approved',
			title: 'Structural steel S355, flux-cored',
			processes: '136',
			materialGroups: '1.2',
			thicknessMin: '6 mm',
			thicknessMax: '40 mm',
			grooveType: 'Fillet; single-bevel',
			preheatMin: '20',
			interpassMax: '250',
			fillerClasses: 'T 46 4 P M 1 H5',
			pqrs: 'PQR-N-0520'
		}
	],
	welders: [
		{
			stamp: 'N03',
			name: 'Sigrun Haldvik',
			employer: 'Nordlys Rør og Stål',
			processes: [
				{
					process: 'GTAW',
					qualifiedOn: '2025-05-12',
					lastUsedOn: '2026-11-23',
					reference: 'WQC-N03-141'
				},
				{
					process: 'SMAW',
					qualifiedOn: '2025-05-12',
					lastUsedOn: '2026-11-23',
					reference: 'WQC-N03-111'
				}
			]
		},
		{
			stamp: 'N11',
			name: 'Pavel Ristovan',
			employer: 'Nordlys Rør og Stål',
			processes: [
				{
					process: 'GTAW',
					qualifiedOn: '2025-01-20',
					lastUsedOn: '2026-11-19',
					reference: 'WQC-N11-141'
				},
				{
					process: 'SMAW',
					qualifiedOn: '2025-01-20',
					lastUsedOn: '2026-11-19',
					reference: 'WQC-N11-111'
				}
			]
		},
		{
			stamp: 'N17',
			name: 'Eira Moldeby',
			employer: 'Fjordsveis Bemanning',
			processes: [
				{
					process: 'GTAW',
					qualifiedOn: '2026-03-03',
					lastUsedOn: '2026-11-26',
					reference: 'WQC-N17-141'
				},
				{
					process: 'SMAW',
					qualifiedOn: '2026-03-03',
					lastUsedOn: '2026-11-26',
					reference: 'WQC-N17-111'
				},
				{
					process: 'FCAW',
					qualifiedOn: '2026-03-03',
					lastUsedOn: '2026-11-12',
					reference: 'WQC-N17-136'
				}
			]
		}
	],
	drawings: [
		metricIso(
			'VFT-3-ISO-0301',
			'Tank T-301 outlet to transfer pump P-305A',
			{ lineNumber: 'DN200-HC-3010-B1', nps: 'DN200', schedule: '8.18 mm', service: 'Gas oil' },
			'Tank farm 3',
			'TP-3-01',
			301,
			12
		),
		metricIso(
			'VFT-3-ISO-0302',
			'Transfer pump discharge header',
			{ lineNumber: 'DN150-HC-3020-B1', nps: 'DN150', schedule: '7.11 mm', service: 'Gas oil' },
			'Tank farm 3',
			'TP-3-01',
			302,
			13
		),
		metricIso(
			'VFT-3-ISO-0303',
			'Vapour return to recovery unit',
			{
				lineNumber: 'DN100-VR-3031-A1',
				nps: 'DN100',
				schedule: '6.02 mm',
				service: 'Vapour return'
			},
			'Jetty approach',
			'TP-3-02',
			303,
			10
		),
		metricIso(
			'VFT-3-ISO-0304',
			'Drain and sample connections, T-301',
			{ lineNumber: 'DN50-DR-3040-B1', nps: 'DN50', schedule: '3.91 mm', service: 'Drain' },
			'Tank farm 3',
			'TP-3-02',
			304,
			9
		),
		{
			number: 'VFT-3-STR-0310',
			title: 'Pipe support frame PS-310 at tank bund crossing',
			kind: 'structural',
			line: '',
			area: 'Tank farm 3',
			system: 'PS-310',
			criteriaSetId: 'iso-5817-c',
			wps: 'WPS-VFT-07 136',
			material: 'S355J2',
			ndeRequired: '',
			revisions: [
				{
					revision: '0',
					revisionDate: '2026-09-28',
					revisionHistory: [
						{ label: '0', date: '2026-09-28', description: 'Issued for fabrication' }
					],
					paper: 'A1',
					seed: 310,
					weldCount: 14
				}
			]
		}
	]
};

export const DEMO_PROJECTS = [LARCHMERE, VELLMAR];
