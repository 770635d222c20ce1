/**
 * The outstanding board, kept current: fetched from the API with the filters, refreshed when
 * the project's event stream says someone recorded something (polling when the stream is down).
 */
import { callApi, failureText } from '$lib/api-client';
import { ProjectFeed } from '$lib/components/project-feed.svelte';
import type { Board } from '$lib/server/outstanding';
import type { JointState } from '$lib/joint-state';

export type BoardData = Board;
export type OwedGroup = Board['owed']['foreman'][number];
export type OwedItem = OwedGroup['items'][number];

export interface BoardFilters {
	area: string;
	drawing: string;
	welder: string;
}

const POLL_MS = 20_000;
/** Joints each "show more" adds to an owed list. */
export const MORE = 50;
/** The API's most per request: a list opened further than this comes back shorter after a refresh. */
const MAX_LIMIT = 200;
/** A batch of requests or a busy crew sends many events at once; one fetch answers them all. */
const SETTLE_MS = 400;

export class BoardStore {
	data = $state<BoardData | null>(null);
	error = $state('');
	#feed = $state<ProjectFeed | null>(null);
	filters = $state<BoardFilters>({ area: '', drawing: '', welder: '' });
	/** Joints fetched by "show more", per owed list, after the board's own first ones. */
	more = $state<Partial<Record<JointState, OwedItem[]>>>({});
	loadingMore = $state<JointState | null>(null);
	private settle: ReturnType<typeof setTimeout> | null = null;
	private generation = 0;

	constructor(readonly projectId: number) {}

	url(list?: { state: JointState; offset: number; limit: number }): string {
		const query = new URLSearchParams();
		for (const [key, value] of Object.entries(this.filters)) if (value) query.set(key, value);
		if (list) {
			query.set('list', list.state);
			query.set('offset', String(list.offset));
			query.set('limit', String(list.limit));
		}
		const search = query.toString();
		return `/api/projects/${this.projectId}/outstanding${search ? `?${search}` : ''}`;
	}

	/** The joints of an owed list shown now: the board's first ones, then those fetched since. */
	items(group: OwedGroup): OwedItem[] {
		const seen = new Set(group.items.map((item) => item.jointId));
		return [
			...group.items,
			...(this.more[group.state] ?? []).filter((item) => !seen.has(item.jointId))
		];
	}

	private async fetchList(state: JointState, offset: number, limit: number) {
		return callApi<OwedGroup>(this.url({ state, offset, limit }));
	}

	/** The next joints of one owed list, oldest first after those shown. */
	async showMore(group: OwedGroup): Promise<void> {
		this.loadingMore = group.state;
		try {
			const list = await this.fetchList(group.state, this.items(group).length, MORE);
			this.more[group.state] = [...(this.more[group.state] ?? []), ...list.items];
			this.error = '';
		} catch (error) {
			this.error = failureText(error, 'More joints could not be loaded.');
		} finally {
			this.loadingMore = null;
		}
	}

	/** New filters: the lists start again from their oldest joints. */
	applyFilters(): Promise<void> {
		this.more = {};
		return this.refresh();
	}

	/** After a refresh, the lists opened further are read again from where the board stops. */
	private async refreshMore(data: BoardData, generation: number) {
		const groups = [...data.owed.foreman, ...data.owed.inspector];
		const more: Partial<Record<JointState, OwedItem[]>> = {};
		for (const group of groups) {
			const open = this.more[group.state]?.length ?? 0;
			if (open === 0) continue;
			const list = await this.fetchList(group.state, group.items.length, Math.min(open, MAX_LIMIT));
			more[group.state] = list.items;
		}
		if (generation === this.generation) this.more = more;
	}

	async refresh(): Promise<void> {
		const generation = ++this.generation;
		try {
			const body = await callApi<BoardData>(this.url());
			if (generation !== this.generation) return;
			if (Object.keys(this.more).length) await this.refreshMore(body, generation);
			if (generation !== this.generation) return;
			this.data = body;
			this.error = '';
		} catch (failure) {
			if (generation === this.generation)
				this.error = failureText(failure, 'The board could not be loaded. Check the connection.');
		}
	}

	private soon() {
		if (this.settle) clearTimeout(this.settle);
		this.settle = setTimeout(() => void this.refresh(), SETTLE_MS);
	}

	follow(): () => void {
		// refresh() shows its own failures as the board's error.
		void this.refresh();
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
