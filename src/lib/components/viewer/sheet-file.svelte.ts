/** One revision's PDF as the viewer sees it: downloading, open, or failed with a reason. */
import { untrack } from 'svelte';
import { describeOpenFailure, openSheetFile, type PDFDocumentProxy } from './pdf';
import type { PDFDocumentLoadingTask } from 'pdfjs-dist';

export class SheetFile {
	pdf = $state.raw<PDFDocumentProxy | null>(null);
	/** 0…1 while downloading, null while the size is unknown. */
	progress = $state<number | null>(null);
	failure = $state<string | null>(null);

	readonly url: string;
	#task: PDFDocumentLoadingTask | null = null;
	#generation = 0;

	constructor(url: string) {
		this.url = url;
	}

	/** Starts (or restarts) the download; safe to call from an effect, it tracks nothing. */
	open(): Promise<void> {
		return untrack(() => this.#open());
	}

	async #open(): Promise<void> {
		this.#close();
		const generation = this.#generation;
		this.failure = null;
		this.progress = null;
		try {
			const opened = await openSheetFile(this.url, (fraction) => {
				if (generation === this.#generation) this.progress = fraction;
			});
			if (generation !== this.#generation) {
				await opened.task.destroy();
				return;
			}
			this.#task = opened.task;
			const pdf = await opened.document;
			if (generation === this.#generation) this.pdf = pdf;
		} catch (err) {
			if (generation === this.#generation) this.failure = describeOpenFailure(err);
		}
	}

	/** Ends the download or frees the open document and its worker. */
	close(): void {
		untrack(() => this.#close());
	}

	#close(): void {
		this.#generation += 1;
		const pdf = this.pdf;
		const task = this.#task;
		this.pdf = null;
		this.#task = null;
		if (pdf) void pdf.destroy();
		else if (task) void task.destroy();
	}
}
