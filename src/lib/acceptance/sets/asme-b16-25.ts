/**
 * ASME B16.25-2017 Buttwelding Ends: the weld-end preparation checked at fit-up.
 * The wall thickness sets the end form: square cut up to 3 mm (0.12 in), a 37.5° bevel above.
 */
import type { CriteriaSet, Expr } from '../types';

const squareCut = 'Walls of 3 mm (0.12 in) and less are cut square or slightly chamfered.';

/** The value above the square-cut wall; at or below it the end form is for the inspector. */
const beveledWall = (value: Expr): Expr => ({
	by: 'thickness',
	steps: [{ upTo: { in: 0.12, mm: 3 }, value: { open: squareCut } }],
	otherwise: value
});

export const asmeB1625: CriteriaSet = {
	id: 'asme-b16.25',
	name: 'ASME B16.25 weld-end preparation',
	standard: 'ASME B16.25',
	edition: '2017',
	version: 1,
	scope: 'Bevel and land of butt-welding ends of pipe and fittings, checked at fit-up.',
	limits: {
		'bevelAngle.range': {
			rule: { type: 'range', min: beveledWall(35), max: beveledWall(40) },
			clause: 'Figs. 2 and 3',
			confidence: '2+',
			note: '37.5° ± 2.5°. Over 22 mm (0.88 in) the bevel is compound: 37.5° up to 19 mm (0.75 in) above the root, then 10° ± 1°, which is not gauged here. B16.9 fitting catalogues square-cut up to 5 mm (carbon steel) or 4 mm (austenitic), not 3 mm. Figure numbers unconfirmed.',
			kinds: ['butt']
		},
		'rootFace.range': {
			rule: {
				type: 'range',
				min: beveledWall({ in: 1 / 32, mm: 0.8 }),
				max: beveledWall({ in: 3 / 32, mm: 2.4 })
			},
			clause: 'Figs. 2 and 3',
			confidence: '2+',
			note: 'Land 1.6 ± 0.8 mm (1/16 ± 1/32 in). Figure numbers unconfirmed.',
			kinds: ['butt']
		}
	}
};
