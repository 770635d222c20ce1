/**
 * The joint card's state: the joint as last loaded, the draft of its fields, the message on
 * top, and the writes that change it. A 409 reloads the joint, so nothing stale stays shown.
 */
import { callApi, failureText, isApiFailure } from '$lib/api-client';
import type { JointDraft } from './JointFieldsForm.svelte';
import type { JointDetail } from './types';

export type CardMessage = { tone: 'ok' | 'error'; text: string; field?: string };

function toDraft(j: JointDetail): JointDraft {
	return {
		kind: j.kind,
		location: j.location,
		line: j.line,
		spool: j.spool,
		size: j.sizeText,
		thickness: j.thicknessText,
		requiredSize: j.requiredSizeText,
		material: j.material,
		wpsId: j.wpsId,
		criteriaSetId: j.criteriaSetId,
		ndeRequired: j.ndeRequired
	};
}

export class JointCardState {
	joint = $state<JointDetail | null>(null);
	draft = $state<JointDraft | null>(null);
	message = $state<CardMessage | null>(null);
	busy = $state(false);
	id = 0;

	constructor(private readonly onChanged: () => void) {}

	async load(id = this.id) {
		this.id = id;
		try {
			const loaded = await callApi<JointDetail>(`/api/joints/${id}`);
			if (id !== this.id) return;
			this.joint = loaded;
			this.draft = toDraft(loaded);
		} catch (failure) {
			this.message = {
				tone: 'error',
				text: failureText(failure, 'The joint could not be loaded.')
			};
		}
	}

	/** Run a write; on success show `done`, on failure its message (and reload after a 409). */
	private async run<T>(action: () => Promise<T>, done: (result: T) => CardMessage | null) {
		this.busy = true;
		try {
			const result = await action();
			const shown = done(result);
			if (shown) this.message = shown;
			this.onChanged();
			return result;
		} catch (failure) {
			const f = isApiFailure(failure)
				? failure
				: { status: 0, error: 'The change could not be saved. Check the connection.' };
			this.message = { tone: 'error', text: f.error, field: f.field };
			if (f.status === 409) await this.load();
			return undefined;
		} finally {
			this.busy = false;
		}
	}

	private post<T>(path: string, payload: object) {
		return callApi<T>(`/api/joints/${this.id}/${path}`, {
			method: 'POST',
			body: JSON.stringify({ ...payload, version: this.joint!.version })
		});
	}

	private showing = (joint: JointDetail, text: string): CardMessage => {
		this.joint = joint;
		this.draft = toDraft(joint);
		return { tone: 'ok', text };
	};

	save = () =>
		this.run(
			() =>
				callApi<JointDetail>(`/api/joints/${this.id}`, {
					method: 'PATCH',
					body: JSON.stringify({ ...this.draft, version: this.joint!.version })
				}),
			(joint) => this.showing(joint, 'Saved.')
		);

	/** Give the joint another weld number; the old one is retired on the drawing. */
	renumber = (number: string) =>
		this.run(
			() =>
				callApi<JointDetail>(`/api/joints/${this.id}`, {
					method: 'PATCH',
					body: JSON.stringify({ number, version: this.joint!.version })
				}),
			(joint) => this.showing(joint, `Renumbered: now weld ${joint.number}.`)
		);

	voidJoint = (reason: string) =>
		this.run(
			() => this.post<JointDetail>('void', { reason }),
			(joint) => this.showing(joint, 'The joint is void; it stays in the log.')
		);

	/** Cut out: the answer is the replacement joint, which the card shows next. */
	cutOut = (reason: string) =>
		this.run(
			() => this.post<{ joint: JointDetail; replaced: { number: string } }>('cut-out', { reason }),
			() => null
		);

	async confirmPin(confirm: () => Promise<void>) {
		this.busy = true;
		try {
			await confirm();
			this.message = { tone: 'ok', text: 'Position confirmed on this revision.' };
		} catch (failure) {
			this.message = {
				tone: 'error',
				text: failureText(failure, 'The pin could not be confirmed.')
			};
		} finally {
			this.busy = false;
		}
	}

	async recorded() {
		await this.load();
		this.message = {
			tone: 'ok',
			text: `Recorded. The joint is now: ${this.joint?.stateLabel ?? ''}.`
		};
		this.onChanged();
	}
}
