/**
 * Which lot a weld falls in: the project's grouping (line, system / test pack, drawing, week
 * welded, root welder, shop or field), per method and extent. Pure.
 */
import type { NdeMethod } from '../joint-state';
import { GROUPING_LABELS, type LotGrouping } from './extent';

/** What grouping reads of a welded joint. */
export interface GroupedJoint {
	location: 'shop' | 'field';
	/** The joint's own line, or '' to take the drawing's. */
	line: string;
	drawingLine: string;
	system: string;
	drawing: string;
	/** `YYYY-MM-DD` of the original weld. */
	weldedOn: string;
	/** Stamp of the original weld's root welder. */
	rootStamp: string | null;
}

/**
 * The ISO 8601 week of a calendar date, e.g. `2026-W41`: weeks start on Monday, and week 1
 * is the week with the year's first Thursday.
 */
export function isoWeek(date: string): string {
	const day = new Date(`${date}T00:00:00Z`);
	if (Number.isNaN(day.getTime())) return '';
	const weekday = (day.getUTCDay() + 6) % 7; // Monday 0 … Sunday 6
	const thursday = new Date(day.getTime() + (3 - weekday) * 86_400_000);
	const year = thursday.getUTCFullYear();
	const dayOfYear = Math.round((thursday.getTime() - Date.UTC(year, 0, 1)) / 86_400_000);
	const week = 1 + Math.floor(dayOfYear / 7);
	return `${year}-W${String(week).padStart(2, '0')}`;
}

/** The grouping's value for a joint: the key lots are matched on, and how it reads. */
export function groupOf(groupBy: LotGrouping, joint: GroupedJoint): { key: string; words: string } {
	switch (groupBy) {
		case 'line': {
			const line = joint.line || joint.drawingLine;
			return line ? { key: line, words: `Line ${line}` } : { key: '', words: 'No line' };
		}
		case 'system':
			return joint.system
				? { key: joint.system, words: `System ${joint.system}` }
				: { key: '', words: 'No system' };
		case 'drawing':
			return { key: joint.drawing, words: `Drawing ${joint.drawing}` };
		case 'week': {
			const week = isoWeek(joint.weldedOn);
			return { key: week, words: week ? `Week ${week}` : 'No weld date' };
		}
		case 'welder':
			return joint.rootStamp
				? { key: joint.rootStamp, words: `Welder ${joint.rootStamp}` }
				: { key: '', words: 'No root welder' };
		case 'location':
			return joint.location === 'field'
				? { key: 'field', words: 'Field welds' }
				: { key: 'shop', words: 'Shop welds' };
	}
}

/** A lot as a person names it: `Line 6"-SG-2001-A1A · RT 5 %`, then `(2)` for the next one. */
export function lotLabel(words: string, method: NdeMethod, percent: number, seq: number): string {
	return `${words} · ${method} ${percent} %${seq > 1 ? ` (${seq})` : ''}`;
}

export function groupingWords(groupBy: LotGrouping): string {
	return GROUPING_LABELS[groupBy].toLowerCase();
}
