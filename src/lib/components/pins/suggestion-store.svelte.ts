/**
 * The weld numbers read from the revision's sheets and not yet on the drawing, as faint marks
 * the user accepts or dismisses; reloaded with the pins, and every few seconds while the
 * sheets are still being read.
 */
import { callApi } from '$lib/api-client';

export interface SuggestionItem {
	number: string;
	pageIndex: number;
	x: number;
	y: number;
	target: { x: number; y: number } | null;
}

export interface SuggestionAnswer {
	status: 'queued' | 'reading' | 'done' | 'failed' | 'none';
	textLayer: boolean | null;
	carried: { inPlace: number; moved: number; flagged: number } | null;
	items: SuggestionItem[];
	error: string | null;
}

const WHILE_READING_MS = 3000;

export class SuggestionStore {
	answer = $state<SuggestionAnswer | null>(null);
	private timer: ReturnType<typeof setTimeout> | undefined;

	constructor(readonly revisionId: number) {}

	get items(): SuggestionItem[] {
		return this.answer?.items ?? [];
	}

	get reading(): boolean {
		return this.answer?.status === 'queued' || this.answer?.status === 'reading';
	}

	async refresh(): Promise<void> {
		clearTimeout(this.timer);
		try {
			this.answer = await callApi<SuggestionAnswer>(
				`/api/revisions/${this.revisionId}/suggestions`
			);
		} catch {
			// Suggestions are a help: the map works without them; the next refresh tries again.
		}
		if (this.reading) this.timer = setTimeout(() => void this.refresh(), WHILE_READING_MS);
	}

	stop() {
		clearTimeout(this.timer);
	}

	private choice(numbers: string[] | 'all') {
		return numbers === 'all' ? { all: true } : { numbers };
	}

	async accept(numbers: string[] | 'all') {
		try {
			return await callApi<{ items: { joint: { id: number; number: string } }[] }>(
				`/api/revisions/${this.revisionId}/suggestions/accept`,
				{ method: 'POST', body: JSON.stringify({ ...this.choice(numbers), joint: {} }) }
			);
		} finally {
			await this.refresh();
		}
	}

	async dismiss(numbers: string[] | 'all') {
		try {
			return await callApi<{ dismissed: number }>(
				`/api/revisions/${this.revisionId}/suggestions/dismiss`,
				{ method: 'POST', body: JSON.stringify(this.choice(numbers)) }
			);
		} finally {
			await this.refresh();
		}
	}

	async reread() {
		this.answer = await callApi<SuggestionAnswer>(`/api/revisions/${this.revisionId}/suggestions`, {
			method: 'POST',
			body: '{}'
		});
		if (this.reading) this.timer = setTimeout(() => void this.refresh(), WHILE_READING_MS);
	}
}
