/**
 * What the lot page does through the NDE API: propose and commit a selection (with swaps made
 * to the proposal), swap a selected weld, close or reopen a lot, pick short tracers again, and
 * send the request to the NDE contractor. Each action reloads the page's data when it lands.
 */
import { invalidateAll } from '$app/navigation';
import { callApi, isApiFailure } from '$lib/api-client';

export interface ProposedWeld {
	id: number;
	drawingId: number;
	drawing: string;
	number: string;
	label: string;
	kind: string;
	size: string;
	welders: string[];
	because: 'welder' | 'percent';
}

export interface Proposal {
	lotId: number;
	seed: number;
	joints: number;
	required: number;
	sampled: number;
	short: number;
	candidates: number;
	picks: ProposedWeld[];
	unrepresentable: { stamp: string; welds: number }[];
}

export interface ProposalSwap {
	out: number;
	in: number;
	reason: string;
	/** How the page names the welds swapped. */
	outLabel: string;
	inLabel: string;
}

export class LotActions {
	busy = $state(false);
	message = $state<{ tone: 'ok' | 'error'; text: string } | null>(null);
	proposal = $state<Proposal | null>(null);
	swaps = $state<ProposalSwap[]>([]);

	constructor(readonly projectId: () => number) {}

	private url(lotId: number, action = '') {
		return `/api/projects/${this.projectId()}/nde/lots/${lotId}${action}`;
	}

	private async run(work: () => Promise<string | null>): Promise<boolean> {
		this.busy = true;
		this.message = null;
		try {
			const text = await work();
			if (text) this.message = { tone: 'ok', text };
			await invalidateAll();
			return true;
		} catch (failure) {
			this.message = {
				tone: 'error',
				text: isApiFailure(failure)
					? failure.error
					: 'That did not reach the server. Check the connection and try again.'
			};
			return false;
		} finally {
			this.busy = false;
		}
	}

	/** Draw a selection with this seed (a fresh one when left out); nothing is stored yet. */
	async propose(lotId: number, seed?: number) {
		this.busy = true;
		this.message = null;
		try {
			const query = seed === undefined ? '' : `?seed=${seed}`;
			this.proposal = await callApi<Proposal>(this.url(lotId, `/selection${query}`));
			this.swaps = [];
		} catch (failure) {
			this.message = {
				tone: 'error',
				text: isApiFailure(failure) ? failure.error : 'The proposal could not be drawn.'
			};
		} finally {
			this.busy = false;
		}
	}

	cancelProposal() {
		this.proposal = null;
		this.swaps = [];
	}

	/** Replace a weld of the proposal by another; the server checks it again on commit. */
	swapInProposal(swap: ProposalSwap) {
		if (!this.proposal) return;
		this.swaps = [...this.swaps, swap];
	}

	/** The proposal's welds with the swaps made to it. */
	picked(): number[] {
		const ids = this.proposal?.picks.map((p) => p.id) ?? [];
		for (const swap of this.swaps) ids[ids.indexOf(swap.out)] = swap.in;
		return ids;
	}

	commit() {
		const proposal = this.proposal;
		if (!proposal) return Promise.resolve(false);
		return this.run(async () => {
			const done = await callApi<{ seed: number; selected: number[] }>(
				this.url(proposal.lotId, '/selection'),
				{
					method: 'POST',
					body: JSON.stringify({
						seed: proposal.seed,
						swaps: this.swaps.map(({ out, in: into, reason }) => ({ out, in: into, reason }))
					})
				}
			);
			this.proposal = null;
			this.swaps = [];
			return `Selected ${done.selected.length} weld${done.selected.length === 1 ? '' : 's'} with seed ${done.seed}; they now await NDE.`;
		});
	}

	swap(lotId: number, out: number, into: number, reason: string) {
		return this.run(async () => {
			await callApi(this.url(lotId, '/swap'), {
				method: 'POST',
				body: JSON.stringify({ out, in: into, reason })
			});
			return 'Swapped; the reason is kept with the selection.';
		});
	}

	close(lotId: number, note: string) {
		return this.run(async () => {
			await callApi(this.url(lotId, '/close'), {
				method: 'POST',
				body: JSON.stringify({ note })
			});
			return 'Lot closed: it takes no more welds. Reopen it if that was a slip.';
		});
	}

	reopen(lotId: number) {
		return this.run(async () => {
			await callApi(this.url(lotId, '/reopen'), { method: 'POST', body: '{}' });
			return 'Lot reopened: it takes welds again.';
		});
	}

	pickTracers(lotId: number) {
		return this.run(async () => {
			const done = await callApi<{ picked: number[] }>(this.url(lotId, '/tracers'), {
				method: 'POST',
				body: '{}'
			});
			return done.picked.length
				? `Picked ${done.picked.length} tracer${done.picked.length === 1 ? '' : 's'}.`
				: 'No weld of that welder is ready yet: the tracers stay short.';
		});
	}

	send(lotIds: number[] | undefined, note: string) {
		return this.run(async () => {
			const sent = await callApi<{ sentTo: string; lines: unknown[] }>(
				`/api/projects/${this.projectId()}/nde/requests`,
				{ method: 'POST', body: JSON.stringify({ lotIds, note }) }
			);
			return `Request sent to ${sent.sentTo}: ${sent.lines.length} weld${sent.lines.length === 1 ? '' : 's'}. Each closes with its result.`;
		});
	}
}
