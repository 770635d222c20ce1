import { describe, expect, it } from 'vitest';
import { pinPointRefusal, PIN_MARGIN_PT } from './pin-bounds';

// ISO 216 A3 landscape is 1191 × 842 points (1 pt = 1/72 in, ISO 32000-1:2008 8.3.2.3).
const a3 = { x0: 0, y0: 0, x1: 1191, y1: 842 };

describe('where a pin may stand', () => {
	it('takes a point on the sheet and just beyond its edge', () => {
		expect(pinPointRefusal(a3, { x: 0, y: 0 })).toBeNull();
		expect(pinPointRefusal(a3, { x: 1191 + PIN_MARGIN_PT, y: -PIN_MARGIN_PT })).toBeNull();
	});

	it('refuses a point off the sheet or not a number, naming the axis', () => {
		expect(pinPointRefusal(a3, { x: -1e308, y: 10 })).toMatchObject({ status: 400, field: 'x' });
		expect(pinPointRefusal(a3, { x: 10, y: 1e308 })).toMatchObject({ status: 400, field: 'y' });
		expect(pinPointRefusal(a3, { x: 10, y: Number.NaN })).toMatchObject({ field: 'y' });
	});
});
