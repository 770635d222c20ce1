// Reads what a drawing sheet is made of, with pdf.js's legacy build: its text items and its
// line work (closed shapes and straight segments), all in unrotated PDF user-space points;
// and renders small grey crops of a sheet for the raster comparison of two revisions.
//
// Plain ESM with no TypeScript and no `$lib`, because it runs in a worker thread started from
// this file's path (server/sheet-reader.worker.mjs): the app's build does not emit worker
// files it finds in the source. It imports only packages from `dependencies`.
import path from 'node:path';
import { createRequire } from 'node:module';

/** @typedef {{ s: string, m: number[], w: number, h: number, font: string }} SheetText */
/**
 * A closed outline: `pts` is a flat list x0 y0 x1 y1 … along it (curves sampled), `curves` how
 * many Bézier pieces it had, `corners` its straight-edge vertex count, `dark` whether it is
 * filled in a dark colour (a weld dot, an arrowhead) rather than paper white.
 * @typedef {{ pts: number[], curves: number, corners: number, fill: boolean, stroke: boolean, dark: boolean }} SheetShape
 */
/**
 * @typedef {{
 *   pageIndex: number, view: number[], rotate: number,
 *   texts: SheetText[], shapes: SheetShape[], segments: number[],
 *   images: number[][], operators: number, truncated: boolean
 * }} SheetGeometry
 */

/** Enough for the densest CAD sheet seen; beyond it line work is dropped, never memory blown. */
const MAX_SEGMENTS = 400_000;
const MAX_SHAPES = 60_000;

const pdfjsDir = path.dirname(createRequire(import.meta.url).resolve('pdfjs-dist/package.json'));
/** pdf.js in Node wants plain file-system paths ending in a separator for its data. */
const dataPaths = {
	standardFontDataUrl: path.join(pdfjsDir, 'standard_fonts') + path.sep,
	cMapUrl: path.join(pdfjsDir, 'cmaps') + path.sep,
	wasmUrl: path.join(pdfjsDir, 'wasm') + path.sep,
	iccUrl: path.join(pdfjsDir, 'iccs') + path.sep
};

/** @type {Promise<typeof import('pdfjs-dist/legacy/build/pdf.mjs')> | undefined} */
let pdfjsModule;
function pdfjs() {
	pdfjsModule ??= import('pdfjs-dist/legacy/build/pdf.mjs');
	return pdfjsModule;
}

/** @param {Uint8Array} data */
export async function openPdf(data) {
	const { getDocument } = await pdfjs();
	const task = getDocument({
		data,
		...dataPaths,
		cMapPacked: true,
		isEvalSupported: false,
		disableFontFace: true,
		useSystemFonts: false,
		verbosity: 0
	});
	return { task, pdf: await task.promise };
}

/** @param {number[]} m @param {number[]} n */
function multiply(m, n) {
	return [
		m[0] * n[0] + m[2] * n[1],
		m[1] * n[0] + m[3] * n[1],
		m[0] * n[2] + m[2] * n[3],
		m[1] * n[2] + m[3] * n[3],
		m[0] * n[4] + m[2] * n[5] + m[4],
		m[1] * n[4] + m[3] * n[5] + m[5]
	];
}

/**
 * @typedef {{ fontMatrix?: number[], vertical?: boolean }} FontFacts
 * @typedef {{
 *   tm: number[], x: number, y: number, lineX: number, lineY: number,
 *   charSpacing: number, wordSpacing: number, hScale: number, leading: number, rise: number,
 *   font: FontFacts | null, fontName: string, size: number, direction: number
 * }} TextState
 */

/**
 * Collects the page's line work and text from pdf.js's operator list, keeping its own
 * transform stack (form XObjects, `cm` inside and outside saved states) and text state, so
 * every glyph lands where pdf.js's canvas would draw it. Text comes out as words split where
 * the sheet leaves a space, measured from the glyphs' own advances: writers that place each
 * glyph on its own (CAD exports, cairo) would otherwise read with spaces inside a number.
 * `fontOf` gives a font's matrix and writing mode by its loaded name; a page with vertical
 * text gets `texts: null` (read it from pdf.js's text content instead).
 * @param {{ fnArray: number[], argsArray: any[] }} list
 * @param {any} OPS
 * @param {(name: string) => FontFacts | null} [fontOf]
 */
export function collectLineWork(list, OPS, fontOf = () => null) {
	/** @type {SheetText[] | null} */
	let texts = [];
	/** @type {TextState} */
	let text = {
		tm: [1, 0, 0, 1, 0, 0],
		x: 0,
		y: 0,
		lineX: 0,
		lineY: 0,
		charSpacing: 0,
		wordSpacing: 0,
		hScale: 1,
		leading: 0,
		rise: 0,
		font: null,
		fontName: '',
		size: 0,
		direction: 1
	};
	/** @type {SheetShape[]} */
	const shapes = [];
	/** @type {number[]} */
	const segments = [];
	/** @type {number[][]} */
	const images = [];
	let truncated = false;
	let ctm = [1, 0, 0, 1, 0, 0];
	let darkFill = true;
	/** @type {{ ctm: number[], darkFill: boolean, text: TextState }[]} */
	const stack = [];
	const strokes = new Set([OPS.stroke, OPS.closeStroke, OPS.fillStroke, OPS.eoFillStroke]);
	strokes.add(OPS.closeFillStroke).add(OPS.closeEOFillStroke);
	const fills = new Set([OPS.fill, OPS.eoFill, OPS.fillStroke, OPS.eoFillStroke]);
	fills.add(OPS.closeFillStroke).add(OPS.closeEOFillStroke);
	const closing = new Set([OPS.closeStroke, OPS.closeFillStroke, OPS.closeEOFillStroke]);

	/** A subpath being read: points in page space, and what it was made of. */
	/** @type {{ pts: number[], curves: number, corners: number, closed: boolean } | null} */
	let open = null;
	/** The previous open polyline of the same paint, for CAD output that draws one piece per path. */
	/** @type {SheetShape | null} */
	let chain = null;

	/** @param {number} x @param {number} y */
	const at = (x, y) => [ctm[0] * x + ctm[2] * y + ctm[4], ctm[1] * x + ctm[3] * y + ctm[5]];

	/** @param {number[]} pts */
	const addSegments = (pts, closed) => {
		if (segments.length / 4 >= MAX_SEGMENTS) {
			truncated = true;
			return;
		}
		const n = pts.length / 2;
		for (let i = 0; i + 1 < n; i++)
			segments.push(pts[2 * i], pts[2 * i + 1], pts[2 * i + 2], pts[2 * i + 3]);
		if (closed && n > 2) segments.push(pts[2 * n - 2], pts[2 * n - 1], pts[0], pts[1]);
	};

	/** @param {SheetShape} shape */
	const addShape = (shape) => {
		if (shapes.length >= MAX_SHAPES) {
			truncated = true;
			return;
		}
		shapes.push(shape);
	};

	const flushChain = () => {
		if (!chain) return;
		const c = chain;
		chain = null;
		const n = c.pts.length;
		if (n >= 8 && near(c.pts[0], c.pts[1], c.pts[n - 2], c.pts[n - 1], c.pts)) {
			c.pts.length -= 2;
			addShape(c);
		}
	};

	/**
	 * @param {number} x0 @param {number} y0 @param {number} x1 @param {number} y1
	 * @param {number[]} pts
	 */
	function near(x0, y0, x1, y1, pts) {
		let minX = Infinity,
			minY = Infinity,
			maxX = -Infinity,
			maxY = -Infinity;
		for (let i = 0; i < pts.length; i += 2) {
			minX = Math.min(minX, pts[i]);
			maxX = Math.max(maxX, pts[i]);
			minY = Math.min(minY, pts[i + 1]);
			maxY = Math.max(maxY, pts[i + 1]);
		}
		const size = Math.max(maxX - minX, maxY - minY);
		return Math.hypot(x1 - x0, y1 - y0) <= Math.max(0.3, size * 0.02);
	}

	/**
	 * @param {{ pts: number[], curves: number, corners: number, closed: boolean }} sub
	 * @param {boolean} fill @param {boolean} stroke
	 */
	const finishSubpath = (sub, fill, stroke) => {
		const pts = sub.pts;
		const n = pts.length / 2;
		if (n < 2) return;
		let closed = sub.closed;
		if (!closed && n >= 3 && near(pts[0], pts[1], pts[2 * n - 2], pts[2 * n - 1], pts)) {
			closed = true;
			pts.length -= 2;
		}
		if (closed && fill && !stroke && pts.length === 8 && thinFill(pts)) {
			// A line drawn as a thin filled rectangle: read as the stroke along its middle.
			const [a, b] = sliverMiddle(pts);
			finishSubpath({ pts: [...a, ...b], curves: 0, corners: 1, closed: false }, false, true);
			return;
		}
		if (closed) {
			flushChain();
			addShape({
				pts,
				curves: sub.curves,
				corners: sub.corners,
				fill,
				stroke,
				dark: fill && darkFill
			});
			if (stroke) addSegments(pts, true);
			return;
		}
		if (stroke) addSegments(pts, false);
		// Exploded outlines (one short piece per path, as some CAD exports write circles; a
		// rewriting tool may turn some pieces round).
		const n2 = pts.length;
		const joins = (/** @type {number} */ x, /** @type {number} */ y) =>
			chain !== null &&
			Math.hypot(chain.pts[chain.pts.length - 2] - x, chain.pts[chain.pts.length - 1] - y) < 0.1;
		const same = chain !== null && chain.fill === fill && chain.stroke === stroke;
		const forward = same && joins(pts[0], pts[1]);
		const backward = same && !forward && joins(pts[n2 - 2], pts[n2 - 1]);
		if (chain && (forward || backward)) {
			const piece = forward ? pts : reversed(pts);
			for (let i = 2; i < piece.length; i++) chain.pts.push(piece[i]);
			chain.curves += sub.curves;
			chain.corners += sub.corners;
			if (chain.pts.length > 4000) chain = null;
		} else {
			flushChain();
			chain = {
				pts: pts.slice(),
				curves: sub.curves,
				corners: sub.corners,
				fill,
				stroke,
				dark: fill && darkFill
			};
		}
	};

	/** @param {number[]} pts */
	function reversed(pts) {
		const out = [];
		for (let i = pts.length - 2; i >= 0; i -= 2) out.push(pts[i], pts[i + 1]);
		return out;
	}

	/**
	 * The two ends of a sliver's long axis.
	 * @param {number[]} pts
	 * @returns {[number[], number[]]}
	 */
	function sliverMiddle(pts) {
		const mid = (/** @type {number} */ i, /** @type {number} */ j) => [
			(pts[2 * i] + pts[2 * j]) / 2,
			(pts[2 * i + 1] + pts[2 * j + 1]) / 2
		];
		const a = Math.hypot(pts[2] - pts[0], pts[3] - pts[1]);
		const b = Math.hypot(pts[4] - pts[2], pts[5] - pts[3]);
		// Long sides 0–1 and 2–3: the middle runs from between 0 and 3 to between 1 and 2.
		return a >= b ? [mid(0, 3), mid(1, 2)] : [mid(0, 1), mid(3, 2)];
	}

	/** A filled sliver is a rule drawn as a rectangle, as some generators draw every line. @param {number[]} pts */
	function thinFill(pts) {
		if (pts.length !== 8) return false;
		const a = Math.hypot(pts[2] - pts[0], pts[3] - pts[1]);
		const b = Math.hypot(pts[4] - pts[2], pts[5] - pts[3]);
		return Math.min(a, b) < 1.5 && Math.max(a, b) > 1.2 * Math.min(a, b);
	}

	/**
	 * @param {number} paint
	 * @param {ArrayLike<number>} buf
	 */
	const readPath = (paint, buf) => {
		const fill = fills.has(paint);
		const stroke = strokes.has(paint);
		if (!fill && !stroke) return; // a clipping path draws nothing
		/** @type {{ pts: number[], curves: number, corners: number, closed: boolean }[]} */
		const subs = [];
		open = null;
		let cx = 0,
			cy = 0,
			sx = 0,
			sy = 0;
		for (let i = 0; i < buf.length;) {
			const code = buf[i];
			if (code === 0) {
				cx = sx = buf[i + 1];
				cy = sy = buf[i + 2];
				open = { pts: at(cx, cy), curves: 0, corners: 0, closed: false };
				subs.push(open);
				i += 3;
			} else if (code === 1) {
				cx = buf[i + 1];
				cy = buf[i + 2];
				if (!open) subs.push((open = { pts: at(cx, cy), curves: 0, corners: 0, closed: false }));
				else {
					open.pts.push(...at(cx, cy));
					open.corners++;
				}
				i += 3;
			} else if (code === 2 || code === 3) {
				const cubic = code === 2;
				const [x1, y1] = [buf[i + 1], buf[i + 2]];
				const [x2, y2] = cubic ? [buf[i + 3], buf[i + 4]] : [x1, y1];
				const [x, y] = cubic ? [buf[i + 5], buf[i + 6]] : [buf[i + 3], buf[i + 4]];
				open ??= subs[subs.push({ pts: at(cx, cy), curves: 0, corners: 0, closed: false }) - 1];
				for (const t of [0.25, 0.5, 0.75, 1]) {
					const u = 1 - t;
					const px = cubic
						? u * u * u * cx + 3 * u * u * t * x1 + 3 * u * t * t * x2 + t * t * t * x
						: u * u * cx + 2 * u * t * x1 + t * t * x;
					const py = cubic
						? u * u * u * cy + 3 * u * u * t * y1 + 3 * u * t * t * y2 + t * t * t * y
						: u * u * cy + 2 * u * t * y1 + t * t * y;
					open.pts.push(...at(px, py));
				}
				open.curves++;
				cx = x;
				cy = y;
				i += cubic ? 7 : 5;
			} else if (code === 4) {
				if (open) {
					open.closed = true;
					open = null;
					cx = sx;
					cy = sy;
				}
				i += 1;
			} else break;
		}
		if (closing.has(paint)) for (const s of subs) s.closed = true;
		// A ring (an outline drawn as a filled band between two closed curves) reads as the
		// outline it draws.
		if (fill && !stroke && subs.length === 2 && subs.every((s) => s.closed || s.curves > 0)) {
			const [outer, inner] = ringOf(subs[0].pts, subs[1].pts);
			if (outer) {
				finishSubpath({ ...subs[0], pts: outer, closed: true }, false, true);
				void inner;
				return;
			}
		}
		for (const s of subs) {
			// Drop a repeated closing point, so a closed outline lists each vertex once.
			const n = s.pts.length;
			if (s.closed && n >= 4 && s.pts[0] === s.pts[n - 2] && s.pts[1] === s.pts[n - 1])
				s.pts.length -= 2;
			finishSubpath(s, fill, stroke);
		}
	};

	const { fnArray, argsArray } = list;
	for (let i = 0; i < fnArray.length; i++) {
		const fn = fnArray[i];
		const args = argsArray[i];
		switch (fn) {
			case OPS.save:
				stack.push({ ctm, darkFill, text: { ...text } });
				break;
			case OPS.restore: {
				const saved = stack.pop();
				if (saved) ({ ctm, darkFill, text } = saved);
				break;
			}
			case OPS.beginText:
				text.tm = [1, 0, 0, 1, 0, 0];
				text.x = text.lineX = text.y = text.lineY = 0;
				break;
			case OPS.setTextMatrix:
				text.tm = Array.from(
					Array.isArray(args[0]) || ArrayBuffer.isView(args[0]) ? args[0] : args
				);
				text.x = text.lineX = text.y = text.lineY = 0;
				break;
			case OPS.moveText:
				text.x = text.lineX += args[0];
				text.y = text.lineY += args[1];
				break;
			case OPS.setLeadingMoveText:
				text.leading = args[1];
				text.x = text.lineX += args[0];
				text.y = text.lineY += args[1];
				break;
			case OPS.nextLine:
				text.x = text.lineX;
				text.y = text.lineY += text.leading;
				break;
			case OPS.setLeading:
				text.leading = -args[0];
				break;
			case OPS.setCharSpacing:
				text.charSpacing = args[0];
				break;
			case OPS.setWordSpacing:
				text.wordSpacing = args[0];
				break;
			case OPS.setHScale:
				text.hScale = args[0] / 100;
				break;
			case OPS.setTextRise:
				text.rise = args[0];
				break;
			case OPS.setFont: {
				const font = fontOf(args[0]);
				text.font = font;
				text.fontName = args[0];
				text.direction = args[1] < 0 ? -1 : 1;
				text.size = Math.abs(args[1]);
				if (font?.vertical) texts = null;
				break;
			}
			case OPS.showText:
				if (texts && text.font && Array.isArray(args[0])) showText(args[0]);
				break;
			case OPS.setFillRGBColor: {
				const n = typeof args?.[0] === 'string' ? Number.parseInt(args[0].slice(1), 16) : 0;
				darkFill = 0.299 * ((n >> 16) & 255) + 0.587 * ((n >> 8) & 255) + 0.114 * (n & 255) < 110;
				break;
			}
			case OPS.transform:
				ctm = multiply(ctm, args);
				break;
			case OPS.paintFormXObjectBegin:
				stack.push({ ctm, darkFill, text: { ...text } });
				if (Array.isArray(args?.[0]) || ArrayBuffer.isView(args?.[0]))
					ctm = multiply(ctm, Array.from(args[0]));
				break;
			case OPS.paintFormXObjectEnd: {
				const saved = stack.pop();
				if (saved) ({ ctm, darkFill, text } = saved);
				break;
			}
			case OPS.constructPath: {
				const [paint, data] = args;
				const buf = data?.[0];
				if (buf && typeof buf.length === 'number') readPath(paint, buf);
				break;
			}
			case OPS.paintImageXObject:
			case OPS.paintInlineImageXObject:
			case OPS.paintImageMaskXObject: {
				const corners = [at(0, 0), at(1, 0), at(0, 1), at(1, 1)];
				const xs = corners.map((c) => c[0]);
				const ys = corners.map((c) => c[1]);
				images.push([Math.min(...xs), Math.min(...ys), Math.max(...xs), Math.max(...ys)]);
				break;
			}
		}
	}
	flushChain();
	return { shapes, segments, images, truncated, texts };

	/**
	 * Places a run of glyphs as canvas.js's showText does, and cuts it into words at spaces
	 * and at gaps wider than a fifth of the size.
	 * @param {any[]} glyphs
	 */
	function showText(glyphs) {
		const font = /** @type {FontFacts} */ (text.font);
		const size = text.size;
		const hScale = text.hScale * text.direction;
		const advanceScale = size * (font.fontMatrix?.[0] ?? 0.001);
		const m = multiply(ctm, text.tm);
		// Baseline direction and glyph height in user space, per unit of text space.
		const along = [m[0], m[1]];
		const upward = [m[2] * size, m[3] * size];
		const height = Math.hypot(upward[0], upward[1]);
		const scaleAlong = Math.hypot(along[0], along[1]);
		if (!height || !scaleAlong) return;
		const at = (/** @type {number} */ tx) => [
			m[0] * tx + m[2] * (text.y + text.rise) + m[4],
			m[1] * tx + m[3] * (text.y + text.rise) + m[5]
		];
		/** @type {{ chars: string, start: number, end: number } | null} */
		let word = null;
		const flush = () => {
			if (!word || !texts) return (word = null);
			const o = at(word.start);
			const e = at(word.end);
			const length = Math.hypot(e[0] - o[0], e[1] - o[1]);
			const ux = length > 1e-9 ? (e[0] - o[0]) / length : along[0] / Math.hypot(...along);
			const uy = length > 1e-9 ? (e[1] - o[1]) / length : along[1] / Math.hypot(...along);
			texts.push({
				s: word.chars,
				m: [ux * height, uy * height, upward[0], upward[1], o[0], o[1]],
				w: length,
				h: height,
				font: text.fontName
			});
			word = null;
		};
		let x = 0;
		for (const g of glyphs) {
			if (typeof g === 'number') {
				x -= (g * size) / 1000;
				continue;
			}
			const spacing = (g.isSpace ? text.wordSpacing : 0) + text.charSpacing;
			const advance = (g.width ?? 0) * advanceScale + spacing * text.direction;
			const start = text.x + x * hScale;
			const end = text.x + (x + (g.width ?? 0) * advanceScale) * hScale;
			const ch = String(g.unicode ?? '').normalize('NFKC');
			const blank = g.isSpace || !ch.trim();
			if (blank) flush();
			else {
				// A gap wider than a fifth of the size between glyphs starts a new word.
				const gap = word ? ((start - word.end) * scaleAlong) / height : 0;
				if (word && (gap > 0.2 || gap < -0.5)) flush();
				if (word) {
					word.chars += ch;
					word.end = end;
				} else word = { chars: ch, start, end };
			}
			x += advance;
		}
		flush();
		text.x += x * hScale;
	}
}

/**
 * Two closed outlines one inside the other, alike and close in size: the outline half-way
 * between them (the ring's middle), else null.
 * @param {number[]} a @param {number[]} b
 * @returns {[number[] | null, number[] | null]}
 */
function ringOf(a, b) {
	const box = (/** @type {number[]} */ p) => {
		let x0 = Infinity,
			y0 = Infinity,
			x1 = -Infinity,
			y1 = -Infinity;
		for (let i = 0; i < p.length; i += 2) {
			x0 = Math.min(x0, p[i]);
			x1 = Math.max(x1, p[i]);
			y0 = Math.min(y0, p[i + 1]);
			y1 = Math.max(y1, p[i + 1]);
		}
		return { x0, y0, x1, y1, w: x1 - x0, h: y1 - y0 };
	};
	const ba = box(a);
	const bb = box(b);
	const [outer, inner, bo, bi] = ba.w >= bb.w ? [a, b, ba, bb] : [b, a, bb, ba];
	const inside = bi.x0 >= bo.x0 && bi.x1 <= bo.x1 && bi.y0 >= bo.y0 && bi.y1 <= bo.y1;
	const alike = bi.w > 0.7 * bo.w && bi.h > 0.7 * bo.h;
	const centred =
		Math.abs(bi.x0 + bi.x1 - bo.x0 - bo.x1) < 0.1 * bo.w &&
		Math.abs(bi.y0 + bi.y1 - bo.y0 - bo.y1) < 0.1 * bo.h;
	if (!inside || !alike || !centred || bo.w < 1) return [null, null];
	// Shrink the outer outline towards the centre by half the band.
	const cx = (bo.x0 + bo.x1) / 2;
	const cy = (bo.y0 + bo.y1) / 2;
	const k = (1 + bi.w / bo.w) / 2;
	const middle = [];
	for (let i = 0; i < outer.length; i += 2)
		middle.push(cx + (outer[i] - cx) * k, cy + (outer[i + 1] - cy) * k);
	return [middle, inner];
}

/**
 * Every page's text and line work, one page at a time (each page's data is handed to
 * `onPage` and dropped before the next is read).
 * @param {Uint8Array} data
 * @param {(page: SheetGeometry) => void | Promise<void>} onPage
 * @returns {Promise<number>} the page count
 */
export async function readSheets(data, onPage) {
	const { OPS, AnnotationMode } = await pdfjs();
	const { task, pdf } = await openPdf(data);
	try {
		for (let n = 1; n <= pdf.numPages; n++) {
			const page = await pdf.getPage(n);
			const list = await page.getOperatorList({ annotationMode: AnnotationMode.DISABLE });
			const work = collectLineWork(list, OPS, (name) => {
				try {
					const font = page.commonObjs.get(name);
					return { fontMatrix: font.fontMatrix, vertical: font.vertical };
				} catch {
					return null;
				}
			});
			let texts = work.texts;
			if (!texts) {
				// Vertical writing: pdf.js's own text content places it.
				texts = [];
				const content = await page.getTextContent({ disableNormalization: false });
				for (const item of content.items) {
					if (!('str' in item) || !item.str.trim()) continue;
					texts.push({
						s: item.str,
						m: item.transform.slice(0, 6),
						w: item.width,
						h: item.height,
						font: item.fontName
					});
				}
			}
			await onPage({
				pageIndex: n - 1,
				view: page.view.slice(0, 4),
				rotate: ((page.rotate % 360) + 360) % 360,
				texts,
				shapes: work.shapes,
				segments: work.segments,
				images: work.images,
				operators: list.fnArray.length,
				truncated: work.truncated
			});
			page.cleanup();
		}
		return pdf.numPages;
	} finally {
		await task.destroy();
	}
}

/**
 * Grey crops of one page around given boxes (PDF points), rendered once at `pxPerPt` and cut
 * out, for comparing a sheet with its previous revision where neither has text to read.
 * @param {Uint8Array} data
 * @param {number} pageIndex
 * @param {number[][]} boxes [x0, y0, x1, y1] in unrotated user space
 * @param {number} pxPerPt
 */
export async function renderCrops(data, pageIndex, boxes, pxPerPt) {
	const { createCanvas } = await import('@napi-rs/canvas');
	const { task, pdf } = await openPdf(data);
	try {
		if (pageIndex >= pdf.numPages) return null;
		const page = await pdf.getPage(pageIndex + 1);
		const [vx0, vy0, vx1, vy1] = page.view;
		// Rendered unrotated, so crops of both revisions line up in user space.
		const longest = Math.max(vx1 - vx0, vy1 - vy0);
		const scale = Math.min(pxPerPt, 6000 / longest);
		const viewport = page.getViewport({ scale, rotation: 0 });
		const width = Math.ceil(viewport.width);
		const height = Math.ceil(viewport.height);
		const canvas = createCanvas(width, height);
		const ctx = canvas.getContext('2d');
		ctx.fillStyle = '#ffffff';
		ctx.fillRect(0, 0, width, height);
		await page.render({
			canvasContext: /** @type {any} */ (ctx),
			canvas: /** @type {any} */ (canvas),
			viewport,
			annotationMode: 0
		}).promise;
		const crops = boxes.map(([x0, y0, x1, y1]) => {
			const [ax, ay] = viewport.convertToViewportPoint(x0, y1);
			const [bx, by] = viewport.convertToViewportPoint(x1, y0);
			const left = Math.max(0, Math.floor(Math.min(ax, bx)));
			const top = Math.max(0, Math.floor(Math.min(ay, by)));
			const w = Math.max(1, Math.min(width, Math.ceil(Math.max(ax, bx))) - left);
			const h = Math.max(1, Math.min(height, Math.ceil(Math.max(ay, by))) - top);
			const rgba = ctx.getImageData(left, top, w, h).data;
			const grey = new Uint8Array(w * h);
			for (let p = 0; p < w * h; p++)
				grey[p] = (rgba[4 * p] * 77 + rgba[4 * p + 1] * 150 + rgba[4 * p + 2] * 29) >> 8;
			return { width: w, height: h, grey, scale };
		});
		page.cleanup();
		return crops;
	} finally {
		await task.destroy();
	}
}
