/**
 * Free text and dates, one way for every input. Text is trimmed and bounded, and refuses what
 * breaks a record downstream: NUL and other control characters (a note keeps its tabs and line
 * breaks, a single-line field refuses line breaks, which would split a stamped footer or a CSV
 * cell), and lone surrogates (half a character, which no file format can write). A date is a
 * real calendar date written YYYY-MM-DD.
 */
import { z } from 'zod';

/** C0 controls and DEL, but for tab, line feed and carriage return. */
// eslint-disable-next-line no-control-regex -- finding control characters is this pattern's job
const CONTROL = /[\u0000-\u0008\u000B\u000C\u000E-\u001F\u007F]/;
const LINE_BREAK = /[\r\n\u2028\u2029]/;
const LONE_SURROGATE = /[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?<![\uD800-\uDBFF])[\uDC00-\uDFFF]/;

/** What is wrong with a piece of text, or null when it may be stored. */
export function textProblem(value: string, multiline: boolean): string | null {
	if (CONTROL.test(value) || (!multiline && value.includes('\t'))) {
		return 'contains a control character; type it again or paste it as plain text';
	}
	if (!multiline && LINE_BREAK.test(value)) return 'is one line: remove the line break';
	if (LONE_SURROGATE.test(value)) return 'contains a broken character; type it again';
	return null;
}

interface TextOptions {
	/** A note or a reason keeps tabs and line breaks; names, numbers and labels do not. */
	multiline?: boolean;
	/** The fewest characters once trimmed, with the message for too few. */
	min?: number;
	minError?: string;
}

/** Trimmed text of at most `max` characters, named `what` in its messages ("The note"). */
export function text(what: string, max: number, options: TextOptions = {}) {
	const { multiline = false, min = 0, minError } = options;
	let schema = z
		.string({ error: `${what} must be text.` })
		.trim()
		.max(max, { error: `${what} has at most ${max} characters.` });
	if (min > 0) schema = schema.min(min, { error: minError ?? `Enter ${what.toLowerCase()}.` });
	return schema.superRefine((value, ctx) => {
		const problem = textProblem(value, multiline);
		if (problem) ctx.addIssue({ code: 'custom', message: `${what} ${problem}.` });
	});
}

/** A note or reason: several lines allowed. */
export function note(what: string, max: number, options: Omit<TextOptions, 'multiline'> = {}) {
	return text(what, max, { ...options, multiline: true });
}

function isCalendarDate(value: string): boolean {
	const date = new Date(`${value}T00:00:00Z`);
	return !Number.isNaN(date.getTime()) && date.toISOString().slice(0, 10) === value;
}

/** A real calendar date written YYYY-MM-DD: `2026-13-45` is refused, naming the field. */
export function calendarDate(what = 'The date') {
	return z
		.string({ error: `${what} must be a date written YYYY-MM-DD.` })
		.trim()
		.regex(/^\d{4}-\d{2}-\d{2}$/, { error: `${what} is a date written YYYY-MM-DD.` })
		.refine(isCalendarDate, { error: `${what} is not on the calendar.` });
}
