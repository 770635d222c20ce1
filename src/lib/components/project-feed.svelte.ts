/**
 * Follows the changes in a project: its server-sent event stream while that is up, polling
 * while it is down. The weld map and the outstanding board both refresh from it.
 */
export class ProjectFeed {
	live = $state(false);
	#source: EventSource | null = null;
	#poll: ReturnType<typeof setInterval> | null = null;

	constructor(
		readonly projectId: number,
		/** Something changed (or may have, while the stream was down): fetch again. */
		readonly onChange: () => void,
		readonly pollMs: number
	) {}

	/** Starts following; returns the function that stops. */
	start(): () => void {
		const startPolling = () => {
			this.#poll ??= setInterval(this.onChange, this.pollMs);
		};
		if (typeof EventSource === 'undefined') startPolling();
		else {
			this.#source = new EventSource(`/api/projects/${this.projectId}/events`);
			this.#source.onopen = () => {
				this.live = true;
				if (this.#poll) clearInterval(this.#poll);
				this.#poll = null;
				// Changes made while the stream was down.
				this.onChange();
			};
			this.#source.onmessage = () => this.onChange();
			this.#source.onerror = () => {
				this.live = false;
				startPolling();
			};
		}
		return () => {
			this.#source?.close();
			this.#source = null;
			if (this.#poll) clearInterval(this.#poll);
			this.#poll = null;
		};
	}
}
