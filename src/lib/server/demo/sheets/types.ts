export type PaperSize = 'ANSI-B' | 'A3' | 'ANSI-D' | 'A1';

export interface DemoParty {
	owner: string;
	contractor: string;
	plant: string;
	projectCode: string;
	projectName: string;
}

export interface DemoLine {
	lineNumber: string;
	/** '6' (imperial NPS) or 'DN150' (metric) */
	nps: string;
	/** 'SCH 40' or a wall such as '7.11 mm' */
	schedule: string;
	material: string;
	service: string;
}

export interface DemoRevisionEntry {
	label: string;
	date: string;
	description: string;
}

export interface DemoSheetSpec {
	kind: 'isometric' | 'shop' | 'structural';
	number: string;
	title: string;
	revision: string;
	/** YYYY-MM-DD */
	revisionDate: string;
	revisionHistory?: DemoRevisionEntry[];
	party: DemoParty;
	units: 'imperial' | 'metric';
	paper: PaperSize;
	/** 90: the MediaBox is portrait and the page carries /Rotate 90, so it displays landscape and upright. */
	rotate?: 0 | 90;
	/** Pages in the file (default 1); each page is "SHEET n OF N" with its own welds. */
	sheets?: number;
	line?: DemoLine;
	area: string;
	system: string;
	/** All randomness comes from this seed: the same spec gives byte-identical output. */
	seed: number;
	/** Target number of welds over all sheets. */
	weldCount: number;
	/** 0 default; 1 = a revised geometry of the same drawing, most welds at the same points. */
	variant?: number;
}

export interface DemoWeld {
	number: string;
	kind: 'butt' | 'fillet' | 'socket' | 'branch';
	location: 'shop' | 'field';
	pageIndex: number;
	/** Centre of the weld dot in unrotated PDF user space, in points. */
	x: number;
	y: number;
	sizeText: string;
	thicknessText: string;
}

export interface DemoPage {
	width: number;
	height: number;
	rotation: 0 | 90;
}

export interface DemoSheet {
	bytes: Uint8Array;
	welds: DemoWeld[];
	pages: DemoPage[];
}
