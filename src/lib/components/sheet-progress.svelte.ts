/**
 * How far the project's uploaded sheets are prepared as tiles, kept up to date from the
 * project's events (or polling while they are down): "Preparing sheets 3/12".
 */
import type { PreparingRevision, TileProgress } from '$lib/sheet-tiles';
import { ProjectFeed } from './project-feed.svelte';

const POLL_MS = 5000;

export class SheetProgress {
	preparing = $state<PreparingRevision[]>([]);
	failed = $state<PreparingRevision[]>([]);
	done = $state(0);
	total = $state(0);
	loaded = $state(false);
	#asking = false;
	#again = false;

	constructor(readonly projectId: number) {}

	/** Starts following; returns the function that stops. */
	start(): () => void {
		const feed = new ProjectFeed(this.projectId, () => void this.refresh(), POLL_MS);
		const stop = feed.start();
		void this.refresh();
		return stop;
	}

	/** One request at a time; a change during it asks once more after. */
	async refresh(): Promise<void> {
		if (this.#asking) {
			this.#again = true;
			return;
		}
		this.#asking = true;
		try {
			const response = await fetch(`/api/projects/${this.projectId}/tiles`);
			if (response.ok) {
				const body = (await response.json()) as TileProgress;
				this.preparing = body.preparing;
				this.failed = body.failed;
				this.done = body.done;
				this.total = body.total;
				this.loaded = true;
			}
		} catch {
			// Offline for a moment: the next event or poll asks again.
		} finally {
			this.#asking = false;
			if (this.#again) {
				this.#again = false;
				void this.refresh();
			}
		}
	}

	/** What a revision's sheets are doing, once the first answer is in. */
	of(revisionId: number): 'preparing' | 'failed' | 'ready' | 'unknown' {
		if (!this.loaded) return 'unknown';
		if (this.preparing.some((r) => r.revisionId === revisionId)) return 'preparing';
		if (this.failed.some((r) => r.revisionId === revisionId)) return 'failed';
		return 'ready';
	}
}
