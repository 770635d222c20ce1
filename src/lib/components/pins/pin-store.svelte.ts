/**
 * The pins of the revision on screen, kept current: fetched from the API, refreshed when the
 * project's event stream says someone changed something (polling when the stream is down),
 * and changed through the API with the joint's version, reloading on a 409.
 */
import type { JointState } from '$lib/joint-state';
import { ProjectFeed } from '$lib/components/project-feed.svelte';
import { callApi, failureText } from '$lib/api-client';

export interface PinItem {
	pinId: number;
	jointId: number;
	number: string;
	label: string;
	repairCycle: number;
	kind: 'butt' | 'fillet' | 'socket' | 'branch';
	location: 'shop' | 'field';
	pageIndex: number;
	x: number;
	y: number;
	state: JointState;
	needsReview: boolean;
	/** Why it waits for review: moved with its number on the new revision, or not found there. */
	reviewReason?: 'moved' | 'missing' | null;
	version: number;
}

const POLL_MS = 15_000;

export class PinStore {
	items = $state<PinItem[]>([]);
	loaded = $state(false);
	error = $state('');
	#feed = $state<ProjectFeed | null>(null);
	private refreshing: Promise<void> | null = null;

	constructor(
		readonly projectId: number,
		readonly revisionId: number
	) {}

	byId(pinId: number | null): PinItem | undefined {
		return pinId == null ? undefined : this.items.find((p) => p.pinId === pinId);
	}

	async refresh(): Promise<void> {
		this.refreshing ??= callApi<{ items: PinItem[] }>(`/api/revisions/${this.revisionId}/pins`)
			.then(({ items }) => {
				this.items = items;
				this.loaded = true;
				this.error = '';
			})
			.catch((failure: unknown) => {
				this.error = failureText(failure, 'The pins could not be loaded. Check the connection.');
			})
			.finally(() => (this.refreshing = null));
		return this.refreshing;
	}

	/** Follow the project's changes; returns the function that stops following. */
	follow(): () => void {
		void this.refresh();
		// Written, never read, here: the effect that calls follow() must not depend on it.
		const feed = new ProjectFeed(this.projectId, () => void this.refresh(), POLL_MS);
		this.#feed = feed;
		return feed.start();
	}

	get live(): boolean {
		return this.#feed?.live ?? false;
	}

	async place(input: {
		pageIndex: number;
		x: number;
		y: number;
		number?: string;
		insertAfter?: string;
		joint: Record<string, string>;
	}) {
		const created = await callApi<{ joint: { id: number; number: string }; pin: { id: number } }>(
			`/api/revisions/${this.revisionId}/pins`,
			{
				method: 'POST',
				body: JSON.stringify(input)
			}
		);
		await this.refresh();
		return created;
	}

	/** Take back a joint placed by mistake (its pin goes with it). */
	async takeBack(jointId: number) {
		try {
			await callApi<null>(`/api/joints/${jointId}`, { method: 'DELETE' });
		} finally {
			await this.refresh();
		}
	}

	/** Move a pin; on a stale version the pins are reloaded and the failure rethrown. */
	async move(pin: PinItem, x: number, y: number): Promise<{ version: number }> {
		const previous = { x: pin.x, y: pin.y };
		Object.assign(pin, { x, y });
		try {
			const moved = await callApi<{ version: number }>(`/api/pins/${pin.pinId}`, {
				method: 'PATCH',
				body: JSON.stringify({ x, y, version: pin.version })
			});
			pin.version = moved.version;
			pin.needsReview = false;
			return moved;
		} catch (failure) {
			Object.assign(pin, previous);
			await this.refresh();
			throw failure;
		}
	}

	async confirm(pin: PinItem) {
		const done = await callApi<{ version: number }>(`/api/pins/${pin.pinId}/confirm`, {
			method: 'POST',
			body: JSON.stringify({ version: pin.version })
		}).catch(async (failure: unknown) => {
			await this.refresh();
			throw failure;
		});
		pin.version = done.version;
		pin.needsReview = false;
	}
}
