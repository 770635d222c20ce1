import {
	PDFDocument,
	StandardFonts,
	concatTransformationMatrix,
	degrees,
	popGraphicsState,
	pushGraphicsState
} from 'pdf-lib';
import { PAPER } from './sheets/frame';
import { isoTargets, renderIsometricPage } from './sheets/isometric';
import { splitTarget, type PageOutcome } from './sheets/page';
import { Pen } from './sheets/pen';
import { renderStructuralPage } from './sheets/structural';
import type { DemoPage, DemoSheet, DemoSheetSpec, DemoWeld } from './sheets/types';

export type {
	DemoLine,
	DemoPage,
	DemoParty,
	DemoRevisionEntry,
	DemoSheet,
	DemoSheetSpec,
	DemoWeld,
	PaperSize
} from './sheets/types';

const round = (v: number) => Math.round(v * 100) / 100;

/** The issue date stands in for the file's own dates, so the same spec gives the same bytes. */
function issueDate(spec: DemoSheetSpec): Date {
	const d = new Date(`${spec.revisionDate}T12:00:00Z`);
	return Number.isNaN(d.getTime()) ? new Date(Date.UTC(2024, 0, 1, 12)) : d;
}

/**
 * Draws an invented drawing as a real PDF: an isometric, a spool (shop) drawing or a
 * structural shop drawing, and reports each weld with the user-space point of its dot.
 */
export async function renderDemoSheet(spec: DemoSheetSpec): Promise<DemoSheet> {
	const doc = await PDFDocument.create({ updateMetadata: false });
	const date = issueDate(spec);
	doc.setTitle(`${spec.number} rev ${spec.revision} - ${spec.title}`);
	doc.setAuthor(spec.party.contractor);
	doc.setSubject(`${spec.party.projectCode} ${spec.party.projectName}`);
	doc.setCreator('Tacksheet demo drawings');
	doc.setProducer('Tacksheet');
	doc.setCreationDate(date);
	doc.setModificationDate(date);
	const regular = await doc.embedFont(StandardFonts.Helvetica);
	const bold = await doc.embedFont(StandardFonts.HelveticaBold);

	const { width, height } = PAPER[spec.paper];
	const rotation = spec.rotate === 90 ? 90 : 0;
	const pageCount = Math.max(1, Math.floor(spec.sheets ?? 1));
	const targets =
		spec.kind === 'structural'
			? splitTarget(spec.weldCount, pageCount, 6, 40)
			: isoTargets(spec, pageCount);
	const welds: DemoWeld[] = [];
	const pages: DemoPage[] = [];
	let nextNumber = 1;
	for (let pageIndex = 0; pageIndex < pageCount; pageIndex++) {
		const media = rotation ? [height, width] : [width, height];
		const page = doc.addPage([media[0], media[1]]);
		if (rotation) {
			page.setRotation(degrees(90));
			// Landscape sheet space onto the portrait MediaBox: the viewer's clockwise /Rotate 90 turns it back upright.
			page.pushOperators(pushGraphicsState(), concatTransformationMatrix(0, 1, -1, 0, height, 0));
		}
		const job = {
			pen: new Pen(page, regular, bold),
			spec,
			pageIndex,
			pageCount,
			width,
			height,
			target: targets[pageIndex],
			firstNumber: nextNumber,
			variant: spec.variant ?? 0
		};
		const outcome: PageOutcome =
			spec.kind === 'structural' ? renderStructuralPage(job) : renderIsometricPage(job);
		if (rotation) page.pushOperators(popGraphicsState());
		nextNumber = outcome.nextNumber;
		for (const w of outcome.welds) {
			const user = rotation ? { x: height - w.at.y, y: w.at.x } : w.at;
			welds.push({
				number: w.number,
				kind: w.kind,
				location: w.location,
				pageIndex,
				x: round(user.x),
				y: round(user.y),
				sizeText: w.sizeText,
				thicknessText: w.thicknessText
			});
		}
		pages.push({ width: media[0], height: media[1], rotation });
	}
	const bytes = await doc.save({ useObjectStreams: true, addDefaultPage: false });
	return { bytes, welds, pages };
}
