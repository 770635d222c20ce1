import { createRequire } from 'node:module';
import path from 'node:path';
import { PDFDocument } from 'pdf-lib';
import { getDocument } from 'pdfjs-dist/legacy/build/pdf.mjs';
import { describe, expect, it } from 'vitest';
import { renderDemoSheet, type DemoSheet, type DemoSheetSpec, type PaperSize } from './sheets';

const standardFontDataUrl = `${path.join(path.dirname(createRequire(import.meta.url).resolve('pdfjs-dist/package.json')), 'standard_fonts')}/`;

const MEDIA: Record<PaperSize, [number, number]> = {
	'ANSI-B': [1224, 792],
	A3: [1190.55, 841.89],
	'ANSI-D': [2448, 1584],
	A1: [2383.94, 1683.78]
};

const party = {
	owner: 'Fenmarch Utilities',
	contractor: 'Orrin Vale Mechanical',
	plant: 'Cobble Reach Works',
	projectCode: 'CRW-7',
	projectName: 'Cooling Loop Upgrade'
};

function spec(over: Partial<DemoSheetSpec>): DemoSheetSpec {
	const kind = over.kind ?? 'isometric';
	return {
		kind,
		number: 'CRW-7-ISO-2040',
		title: kind === 'structural' ? 'Pipe rack beam' : 'Cooling water return',
		revision: '0',
		revisionDate: '2024-06-03',
		party,
		units: 'imperial',
		paper: 'ANSI-B',
		line:
			kind === 'structural'
				? undefined
				: {
						lineNumber: '6"-CW-2040-A1A',
						nps: '6',
						schedule: 'SCH 40',
						material: 'ASTM A106 Gr. B',
						service: 'Cooling water'
					},
		area: 'Area 20',
		system: 'CW-02',
		seed: 11,
		weldCount: kind === 'structural' ? 18 : 14,
		...over
	};
}

interface Placed {
	str: string;
	x: number;
	y: number;
}

/** Every text item of every page, at its origin in PDF user space, as a viewer's text layer sees it. */
async function textByPage(bytes: Uint8Array): Promise<Placed[][]> {
	const pdf = await getDocument({ data: bytes.slice(), standardFontDataUrl, disableFontFace: true })
		.promise;
	try {
		const pages: Placed[][] = [];
		for (let i = 1; i <= pdf.numPages; i++) {
			const page = await pdf.getPage(i);
			const content = await page.getTextContent();
			const items: Placed[] = [];
			for (const item of content.items)
				if ('str' in item)
					items.push({ str: item.str.trim(), x: item.transform[4], y: item.transform[5] });
			pages.push(items);
		}
		return pages;
	} finally {
		await pdf.destroy();
	}
}

async function expectNumbersAtDots(sheet: DemoSheet): Promise<void> {
	const pages = await textByPage(sheet.bytes);
	for (const weld of sheet.welds) {
		const nearest = Math.min(
			...pages[weld.pageIndex]
				.filter((t) => t.str === weld.number)
				.map((t) => Math.hypot(t.x - weld.x, t.y - weld.y))
		);
		expect(nearest, `weld ${weld.number} on page ${weld.pageIndex + 1}`).toBeLessThanOrEqual(20);
	}
}

const papers = Object.keys(MEDIA) as PaperSize[];
const kinds: DemoSheetSpec['kind'][] = ['isometric', 'shop', 'structural'];

describe('renderDemoSheet', () => {
	it.each(
		kinds.flatMap((kind, k) =>
			papers.map((paper, p) => ({
				kind,
				paper,
				seed: 3 + k * 7 + p,
				units: p % 2 ? ('metric' as const) : ('imperial' as const)
			}))
		)
	)(
		'draws a $kind sheet on $paper with the weld numbers at the returned points',
		async ({ kind, paper, seed, units }) => {
			const s = spec({
				kind,
				paper,
				seed,
				units,
				line:
					kind === 'structural'
						? undefined
						: {
								lineNumber: 'DN150-CW-2040',
								nps: units === 'metric' ? 'DN150' : '6',
								schedule: units === 'metric' ? '7.11 mm' : 'SCH 40',
								material: 'P265GH',
								service: 'Cooling water'
							}
			});
			const sheet = await renderDemoSheet(s);
			const doc = await PDFDocument.load(sheet.bytes);
			expect(doc.getPageCount()).toBe(1);
			const size = doc.getPage(0).getSize();
			expect(size.width).toBeCloseTo(MEDIA[paper][0], 1);
			expect(size.height).toBeCloseTo(MEDIA[paper][1], 1);
			expect(doc.getPage(0).getRotation().angle).toBe(0);
			expect(sheet.pages).toEqual([{ width: size.width, height: size.height, rotation: 0 }]);
			expect(sheet.welds).toHaveLength(s.weldCount);
			expect(new Set(sheet.welds.map((w) => w.number)).size).toBe(sheet.welds.length);
			for (const w of sheet.welds) {
				expect(w.x).toBeGreaterThan(0);
				expect(w.x).toBeLessThan(size.width);
				expect(w.y).toBeGreaterThan(0);
				expect(w.y).toBeLessThan(size.height);
				expect(w.sizeText).not.toBe('');
				expect(w.thicknessText).not.toBe('');
			}
			if (kind === 'shop') expect(sheet.welds.every((w) => w.location === 'shop')).toBe(true);
			if (kind === 'structural') expect(sheet.welds.some((w) => w.kind === 'fillet')).toBe(true);
			await expectNumbersAtDots(sheet);
		}
	);

	it('rotated sheets carry /Rotate 90 on a portrait MediaBox and number on across sheets', async () => {
		const s = spec({ rotate: 90, sheets: 2, weldCount: 30, seed: 5 });
		const sheet = await renderDemoSheet(s);
		const doc = await PDFDocument.load(sheet.bytes);
		expect(doc.getPageCount()).toBe(2);
		for (const page of doc.getPages()) {
			expect(page.getRotation().angle).toBe(90);
			expect(page.getSize()).toEqual({ width: 792, height: 1224 });
		}
		expect(sheet.pages).toEqual([
			{ width: 792, height: 1224, rotation: 90 },
			{ width: 792, height: 1224, rotation: 90 }
		]);
		expect(sheet.welds).toHaveLength(30);
		expect(sheet.welds.map((w) => w.number)).toEqual(
			Array.from({ length: 30 }, (_, i) => String(i + 1))
		);
		expect(new Set(sheet.welds.map((w) => w.pageIndex))).toEqual(new Set([0, 1]));
		expect(sheet.welds.every((w) => w.x < 792 && w.y < 1224)).toBe(true);
		await expectNumbersAtDots(sheet);
	});

	it('gives byte-identical files for the same spec', async () => {
		for (const kind of kinds) {
			const s = spec({
				kind,
				seed: 42,
				paper: kind === 'structural' ? 'ANSI-D' : 'A3',
				rotate: kind === 'shop' ? 90 : 0
			});
			const [a, b] = await Promise.all([renderDemoSheet(s), renderDemoSheet(s)]);
			expect(Buffer.from(a.bytes).equals(Buffer.from(b.bytes))).toBe(true);
			expect(a.welds).toEqual(b.welds);
		}
	});

	it.each(kinds)('a revised %s keeps most welds where they were and adds some', async (kind) => {
		const s = spec({
			kind,
			seed: 77,
			paper: kind === 'structural' ? 'A1' : 'ANSI-B',
			units: kind === 'shop' ? 'metric' : 'imperial'
		});
		const first = await renderDemoSheet(s);
		const revised = await renderDemoSheet({
			...s,
			variant: 1,
			revision: '1',
			revisionHistory: [
				{ label: '0', date: '2024-06-03', description: 'Issued for construction' },
				{ label: '1', date: '2024-08-19', description: 'Branch added' }
			]
		});
		const kept = first.welds.filter((w) =>
			revised.welds.some(
				(r) => r.number === w.number && r.pageIndex === w.pageIndex && r.x === w.x && r.y === w.y
			)
		);
		expect(kept.length).toBeGreaterThanOrEqual(Math.ceil(first.welds.length * 0.8));
		const added = revised.welds.filter((r) => !first.welds.some((w) => w.number === r.number));
		expect(added.length).toBeGreaterThanOrEqual(1);
		expect(added.every((w) => /^\d+[A-Z]$/.test(w.number))).toBe(true);
		expect(Buffer.from(first.bytes).equals(Buffer.from(revised.bytes))).toBe(false);
		await expectNumbersAtDots(revised);
	});

	it('keeps party names that the standard fonts cannot encode', async () => {
		const sheet = await renderDemoSheet(
			spec({ party: { ...party, owner: 'Łódź Żeglarz ⌀ ≤ Co.' } })
		);
		expect(sheet.bytes.byteLength).toBeGreaterThan(1000);
	});
});
