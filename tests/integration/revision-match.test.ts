/**
 * A new revision flags only what changed. Two revisions of an invented test sheet: labels
 * moved (with their weld), deleted and added between them; the finder reads both and
 * matchRevision sorts the old pins into carried, moved and flagged, exactly as planned. A
 * scanned pair (no text) with one weld erased is sorted by comparing the images around pins.
 */
import { describe, expect, it } from 'vitest';
import { matchRevision, type SheetPoint } from '$lib/revision-match';
import { findWeldNumbers, type SheetSuggestions } from '$lib/server/sheet-text/finder';
import { compareAroundPins } from '$lib/server/sheet-text/raster';
import { familySpec } from '../fixtures/iso-drawings/families';
import { measuringFonts, metricsOf } from '../fixtures/iso-drawings/fonts';
import type { SheetModel } from '../fixtures/iso-drawings/model';
import { writePdf } from '../fixtures/iso-drawings/pdf';
import { rasterOnly } from '../fixtures/iso-drawings/raster';
import { reviseSheet, type RevisionPlan } from '../fixtures/iso-drawings/revise';
import { drawSheet } from '../fixtures/iso-drawings/sheet';

const RULE = { shopPrefix: '', fieldPrefix: 'FW-' };

const pagesOf = (found: SheetSuggestions) =>
	found.pages.map((p) => ({
		pageIndex: p.pageIndex,
		width: p.view[2] - p.view[0],
		height: p.view[3] - p.view[1],
		textLayer: p.textLayer
	}));

/** A pin on every labelled weld of the sheet, at the weld itself. */
const pinsOf = (model: SheetModel): (SheetPoint & { id: number })[] =>
	model.labels.map((l, id) => ({ id, number: l.number, pageIndex: 0, x: l.weld[0], y: l.weld[1] }));

async function sheetAndPlan() {
	const metrics = metricsOf(await measuringFonts());
	const model = drawSheet(familySpec('iso-circles', 0), metrics);
	const numbers = model.labels.map((l) => l.number);
	const bare = numbers.filter((n) => /^\d\d$/.test(n));
	const plan: RevisionPlan = {
		move: [numbers[2], numbers[7], numbers[11]],
		remove: [numbers[4], numbers[9]],
		add: [
			{ like: bare[0], number: '98', printed: '98' },
			{ like: bare[1], number: '97', printed: '97' }
		]
	};
	return { metrics, model, plan };
}

describe('a new revision with text', () => {
	it('carries unchanged pins, moves the moved with their label, flags the deleted, offers the new', async () => {
		const { metrics, model, plan } = await sheetAndPlan();
		expect(model.labels.length).toBeGreaterThan(15);
		const revised = reviseSheet(model, plan, metrics);
		const before = await findWeldNumbers((await writePdf([model])).bytes, RULE);
		const after = await findWeldNumbers((await writePdf([revised.model])).bytes, RULE);
		const pins = pinsOf(model);

		const result = matchRevision({
			pins,
			oldLabels: before.items,
			newLabels: after.items,
			newPages: pagesOf(after)
		});
		expect(result.counts).toEqual({ carried: pins.length - 5, moved: 3, flagged: 2 });
		for (const fate of result.fates) {
			const number = fate.pin.number;
			if (plan.remove.includes(number)) {
				expect(fate.status, number).toBe('flagged');
				expect(fate.reason).toBe('label missing');
				// A flagged pin stays where it was, for a person to look at.
				expect([fate.x, fate.y]).toEqual([fate.pin.x, fate.pin.y]);
			} else if (plan.move.includes(number)) {
				expect(fate.status, number).toBe('moved');
				// The pin follows its weld to the new place.
				const [dx, dy] = revised.offsets.get(number)!;
				expect(Math.hypot(fate.x - (fate.pin.x + dx), fate.y - (fate.pin.y + dy))).toBeLessThan(1);
			} else {
				expect(fate.status, number).toBe('carried');
				expect([fate.x, fate.y]).toEqual([fate.pin.x, fate.pin.y]);
			}
		}
		expect(result.newNumbers.map((n) => n.number).sort()).toEqual(['97', '98']);
	});

	it('sorts the same way with no labels kept from the old revision, by where the new labels point', async () => {
		const { metrics, model, plan } = await sheetAndPlan();
		const revised = reviseSheet(model, plan, metrics);
		const after = await findWeldNumbers((await writePdf([revised.model])).bytes, RULE);
		const result = matchRevision({
			pins: pinsOf(model),
			newLabels: after.items,
			newPages: pagesOf(after)
		});
		expect(result.counts).toEqual({ carried: model.labels.length - 5, moved: 3, flagged: 2 });
		for (const fate of result.fates.filter((f) => f.status === 'moved')) {
			// Moved to where the new label points: its weld.
			const [dx, dy] = revised.offsets.get(fate.pin.number)!;
			expect(Math.hypot(fate.x - (fate.pin.x + dx), fate.y - (fate.pin.y + dy))).toBeLessThan(4);
		}
	});
});

describe('a new revision of a scanned drawing', () => {
	it('flags only the pin whose surroundings changed between the two images', async () => {
		const { metrics, model } = await sheetAndPlan();
		const pins = pinsOf(model);
		// A weld standing on its own, so its change shows in no other pin's surroundings.
		const lone = model.labels.find((l) => {
			const marks = revisedBox(model, l.number, metrics);
			return pins.every(
				(p) =>
					p.number === l.number ||
					p.x < marks.x0 - 25 ||
					p.x > marks.x1 + 25 ||
					p.y < marks.y0 - 25 ||
					p.y > marks.y1 + 25
			);
		});
		expect(lone).toBeDefined();
		const erased = reviseSheet(model, { move: [], remove: [lone!.number], add: [] }, metrics);
		const before = await rasterOnly((await writePdf([model])).bytes);
		const after = await rasterOnly((await writePdf([erased.model])).bytes);

		const found = await findWeldNumbers(after, RULE);
		expect(found.textLayer).toBe(false);
		const raster = await compareAroundPins(before, after, pins);
		const result = matchRevision({
			pins,
			newLabels: found.items,
			newPages: pagesOf(found),
			raster
		});
		expect(result.counts).toEqual({ carried: pins.length - 1, moved: 0, flagged: 1 });
		const flagged = result.fates.find((f) => f.status === 'flagged')!;
		expect(flagged.pin.number).toBe(lone!.number);
		expect(flagged.reason).toBe('image changed');
		expect(
			result.fates
				.filter((f) => f.status === 'carried')
				.every((f) => f.reason === 'image unchanged')
		).toBe(true);
	});
});

/** The box of one weld's marks: its dot, leader, bubble and number. */
function revisedBox(
	model: SheetModel,
	number: string,
	metrics: Awaited<ReturnType<typeof metricsOf>>
) {
	let x0 = Infinity;
	let y0 = Infinity;
	let x1 = -Infinity;
	let y1 = -Infinity;
	for (const m of model.marks) {
		if (m.group !== number) continue;
		const pts =
			m.kind === 'text'
				? [m.at, [m.at[0] + metrics.width(m.text, m.font, m.size), m.at[1] + m.size]]
				: m.subpaths.flatMap((s) => [s.start, ...s.segs.flatMap((g) => ('L' in g ? [g.L] : g.C))]);
		for (const [x, y] of pts) {
			x0 = Math.min(x0, x);
			y0 = Math.min(y0, y);
			x1 = Math.max(x1, x);
			y1 = Math.max(y1, y);
		}
	}
	return { x0, y0, x1, y1 };
}
