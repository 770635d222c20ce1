/**
 * The outstanding board, kept current: fetched from the API with the filters, refreshed when
 * the project's event stream says someone recorded something (polling when the stream is down).
 */
import { ProjectFeed } from '$lib/components/project-feed.svelte';
import type { Board } from '$lib/server/outstanding';

export type BoardData = Board;
export type OwedGroup = Board['owed']['foreman'][number];
export type OwedItem = OwedGroup['items'][number];

export interface BoardFilters {
	area: string;
	drawing: string;
	welder: string;
}

const POLL_MS = 20_000;
/** A batch of requests or a busy crew sends many events at once; one fetch answers them all. */
const SETTLE_MS = 400;

export class BoardStore {
	data = $state<BoardData | null>(null);
	error = $state('');
	#feed = $state<ProjectFeed | null>(null);
	filters = $state<BoardFilters>({ area: '', drawing: '', welder: '' });
	private settle: ReturnType<typeof setTimeout> | null = null;
	private generation = 0;

	constructor(readonly projectId: number) {}

	url(): string {
		const query = new URLSearchParams();
		for (const [key, value] of Object.entries(this.filters)) if (value) query.set(key, value);
		const search = query.toString();
		return `/api/projects/${this.projectId}/outstanding${search ? `?${search}` : ''}`;
	}

	async refresh(): Promise<void> {
		const generation = ++this.generation;
		try {
			const response = await fetch(this.url(), { headers: { accept: 'application/json' } });
			const body = await response.json().catch(() => ({}));
			if (generation !== this.generation) return;
			if (!response.ok) {
				this.error = body.error ?? `The server answered ${response.status}.`;
				return;
			}
			this.data = body as BoardData;
			this.error = '';
		} catch {
			if (generation === this.generation)
				this.error = 'The board could not be loaded. Check the connection.';
		}
	}

	private soon() {
		if (this.settle) clearTimeout(this.settle);
		this.settle = setTimeout(() => this.refresh(), SETTLE_MS);
	}

	follow(): () => void {
		this.refresh();
		// Written, never read, here: the effect that calls follow() must not depend on it.
		const feed = new ProjectFeed(this.projectId, () => this.soon(), POLL_MS);
		this.#feed = feed;
		const stop = feed.start();
		return () => {
			stop();
			if (this.settle) clearTimeout(this.settle);
		};
	}

	get live(): boolean {
		return this.#feed?.live ?? false;
	}
}
