/**
 * Gauge readings for the demo joints: what an inspector would write on a fit-up or visual
 * report, good or bad, in the project's units. Invented values, for the demo only.
 */
import type { JointKind, UnitSystem } from '../db/schema';

export type ReadingTexts = Record<string, string | boolean>;
export type DemoOutcome = 'good' | 'bad';

type Pick = <T>(items: readonly T[]) => T;

const FITUP = {
	imperial: {
		good: {
			rootOpening: ['3/32', '1/8', '1/8"'],
			bevelAngle: ['37-1/2°', '37.5 deg', '37°'],
			rootFace: ['1/16', '3/32'],
			misalignment: ['0', '1/32', '1/64']
		},
		bad: { rootOpening: ['3/16', '7/32'], misalignment: ['3/32', '1/8'] }
	},
	metric: {
		good: {
			rootOpening: ['2.5 mm', '3 mm', '3,0 mm'],
			bevelAngle: ['37.5°', '37°', '38°'],
			rootFace: ['1.5 mm', '2 mm'],
			misalignment: ['0 mm', '0.5 mm', '0.8 mm']
		},
		bad: { rootOpening: ['5 mm', '5.5 mm'], misalignment: ['2.5 mm', '3 mm'] }
	}
} as const;

const FILLET_FITUP = {
	imperial: { good: ['0', '1/32', '1/16'], bad: ['1/4', '5/16'] },
	metric: { good: ['0 mm', '1 mm', '1.5 mm'], bad: ['6 mm', '7 mm'] }
} as const;

const VISUAL_BUTT = {
	imperial: {
		reinforcement: ['1/32', '1/16', '3/32'],
		undercutDepth: ['0', '1/64'],
		badUndercut: ['1/16', '3/32']
	},
	metric: {
		reinforcement: ['1 mm', '1.5 mm', '2 mm'],
		undercutDepth: ['0 mm', '0.2 mm', '0.3 mm'],
		badUndercut: ['1.5 mm', '2 mm']
	}
} as const;

export function fitupReadings(
	kind: JointKind,
	units: UnitSystem,
	outcome: DemoOutcome,
	wall: string,
	pick: Pick
): ReadingTexts {
	if (kind === 'fillet') {
		return { rootOpening: pick(FILLET_FITUP[units][outcome]) };
	}
	const good = FITUP[units].good;
	const readings: ReadingTexts = {
		rootOpening: pick(good.rootOpening),
		bevelAngle: pick(good.bevelAngle),
		rootFace: pick(good.rootFace),
		misalignment: pick(good.misalignment),
		wallThickness: wall
	};
	if (kind === 'socket') {
		// A socket weld has no bevel: the gap before welding is what is checked.
		return { rootOpening: units === 'imperial' ? '1/16' : '1.5 mm' };
	}
	if (outcome === 'bad') {
		const bad = FITUP[units].bad;
		if (pick([true, false])) readings.rootOpening = pick(bad.rootOpening);
		else readings.misalignment = pick(bad.misalignment);
	}
	return readings;
}

export function visualReadings(
	kind: JointKind,
	units: UnitSystem,
	outcome: DemoOutcome,
	requiredSize: string,
	pick: Pick
): ReadingTexts {
	const defects = { crack: false, overlap: false, craterUnfilled: false, incompleteFusion: false };
	if (kind === 'fillet' || kind === 'socket') {
		const leg = requiredSize || (units === 'imperial' ? '1/4' : '6 mm');
		const readings: ReadingTexts = {
			filletLeg1: leg,
			filletLeg2: leg,
			convexity: units === 'imperial' ? pick(['1/32', '1/16']) : pick(['1 mm', '1.5 mm']),
			undercutDepth: pick(VISUAL_BUTT[units].undercutDepth),
			...defects
		};
		if (outcome === 'bad') {
			if (pick([true, false])) readings.crack = true;
			else readings.undercutDepth = pick(VISUAL_BUTT[units].badUndercut);
		}
		return readings;
	}
	const readings: ReadingTexts = {
		reinforcement: pick(VISUAL_BUTT[units].reinforcement),
		undercutDepth: pick(VISUAL_BUTT[units].undercutDepth),
		...defects
	};
	if (outcome === 'bad') {
		if (pick([true, false, false])) readings.incompleteFusion = true;
		else readings.undercutDepth = pick(VISUAL_BUTT[units].badUndercut);
	}
	return readings;
}
