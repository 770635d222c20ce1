/**
 * The indications list of an RT or UT result as the NDE form holds it, and the engine's
 * findings on it in words. Pure, so it is tested on its own and the components stay small.
 */
import {
	indicationLabels,
	type IndicationFinding,
	type IndicationInput,
	type IndicationPart,
	type IndicationType
} from '$lib/acceptance';
import type { UnitSystem } from '$lib/units';
import { formatMeasure, type Detail } from './present';

/** One row of the list: the type chosen and each dimension as typed. */
export interface IndicationEntry {
	type: IndicationType;
	length: string;
	width: string;
	depth: string;
	position: string;
	/** RT: the image is darker than the thinnest adjacent parent metal */
	darker?: boolean;
}

export const blankIndication = (type: IndicationType = 'porosity'): IndicationEntry => ({
	type,
	length: '',
	width: '',
	depth: '',
	position: ''
});

/** What the engine is given: blank dimensions left out. */
export function indicationInputs(entries: readonly IndicationEntry[]): IndicationInput[] {
	return entries.map((entry) => {
		const input: IndicationInput = { type: entry.type };
		for (const dimension of ['length', 'width', 'depth', 'position'] as const) {
			const typed = entry[dimension].trim();
			if (typed !== '') input[dimension] = typed;
		}
		if (entry.darker !== undefined) input.darker = entry.darker;
		return input;
	});
}

export type IndicationDimension = 'length' | 'width' | 'depth' | 'position' | 'darker';

/** Kinds whose width the codes limit: slag lines, pores. */
const WIDTHS: readonly IndicationType[] = [
	'elongatedSlag',
	'isolatedSlag',
	'tungsten',
	'porosity',
	'clusterPorosity'
];
/** Kinds whose depth a code limits where the method shows it. */
const DEPTHS: readonly IndicationType[] = ['incompletePenetration', 'lackOfFusion', 'undercut'];
/** Kinds judged by how dark their image is against the parent metal. */
const DENSITY: readonly IndicationType[] = ['internalConcavity', 'burnThrough'];

/** The dimensions a row asks for: what the codes judge the kind by, and where it lies. */
export function dimensionsFor(type: IndicationType, method: 'RT' | 'UT'): IndicationDimension[] {
	const asked: IndicationDimension[] = ['length'];
	if (WIDTHS.includes(type)) asked.push('width');
	if (method === 'UT' || DEPTHS.includes(type)) asked.push('depth');
	asked.push('position');
	if (method === 'RT' && DENSITY.includes(type)) asked.push('darker');
	return asked;
}

export const dimensionLabels: Record<Exclude<IndicationDimension, 'darker'>, string> = {
	length: 'Length',
	width: 'Width',
	depth: 'Depth',
	position: 'From datum'
};

const partWords: Record<IndicationPart, string> = {
	present: 'present',
	length: 'longest',
	width: 'widest',
	depth: 'deepest',
	aggregate: 'in the worst stretch',
	share: 'in the whole weld',
	count: 'number',
	distribution: 'size and spacing'
};

const groupWords: Record<string, string> = {
	slag: 'Slag inclusions together',
	accumulation: 'All imperfections together'
};

export function findingLabel(finding: IndicationFinding): string {
	if (finding.type === null) {
		const id = finding.check.replace(/^nde\.group\./, '').replace(/\.share$/, '');
		const words = groupWords[id] ?? 'Indications together';
		return `${words}, ${finding.check.endsWith('.share') ? 'in the whole weld' : 'in the worst stretch'}`;
	}
	return `${indicationLabels[finding.type]}: ${partWords[finding.part]}`;
}

export function measuredText(
	finding: IndicationFinding,
	units: UnitSystem,
	detail: Detail = 'both'
) {
	return formatMeasure(finding.measured, finding.unit, units, detail);
}

export function limitWords(finding: IndicationFinding, units: UnitSystem, detail: Detail = 'both') {
	const show = (value: number) => formatMeasure(value, finding.unit, units, detail);
	if (finding.part === 'present' && finding.limit === 0) return 'none allowed';
	if (finding.bounds) {
		return `at most ${show(finding.bounds.min)} or ${show(finding.bounds.max)}, by joint data not given`;
	}
	if (finding.limit === null) return 'no fixed limit';
	return `at most ${show(finding.limit)}`;
}
