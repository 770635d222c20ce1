/** One dropped file on its way to the register: what it will become, and how its upload goes. */
import { proposeFromFileName } from '$lib/drawing-names';
import { statusText } from '$lib/api-client';
import { plural } from '$lib/words';

export interface ExistingDrawing {
	id: number;
	number: string;
	title: string;
	kind: string;
	labels: string[];
	current: string | null;
}

export type UploadStatus = 'ready' | 'uploading' | 'processing' | 'done' | 'failed';

/** The label after the current one: 0 → 1, A → B; empty when it cannot be guessed. */
export function nextLabel(current: string | null): string {
	if (!current) return '0';
	if (/^\d+$/.test(current)) return String(Number(current) + 1);
	if (/^[A-Y]$/.test(current)) return String.fromCharCode(current.charCodeAt(0) + 1);
	return '';
}

/** What a new revision did with the pins of the one before, as the upload answer says. */
export function carriedText(body: {
	pinsCarried?: number;
	pinsInPlace?: number | null;
	pinsMoved?: number | null;
	pinsFlagged?: number | null;
}): string {
	if (!body.pinsCarried) return '';
	if (body.pinsInPlace == null)
		return ` ${plural(body.pinsCarried, 'weld mark')} carried over, flagged to be checked while its sheets are read.`;
	return ` ${plural(body.pinsCarried, 'weld mark')} carried over: ${body.pinsInPlace} in place, ${body.pinsMoved ?? 0} moved with their number and ${body.pinsFlagged ?? 0} not found; the moved and not-found marks wait to be checked.`;
}

export class UploadItem {
	readonly file: File;
	number = $state('');
	title = $state('');
	kind = $state<'isometric' | 'shop' | 'structural'>('isometric');
	line = $state('');
	area = $state('');
	system = $state('');
	label = $state('0');
	note = $state('');
	status = $state<UploadStatus>('ready');
	progress = $state(0);
	message = $state('');
	resultHref = $state('');
	/** The revision stored, once the upload has succeeded. */
	revisionId = $state<number | null>(null);

	constructor(
		file: File,
		private readonly existing: ExistingDrawing[]
	) {
		this.file = file;
		const proposed = proposeFromFileName(file.name);
		this.number = proposed.number;
		const match = this.match;
		this.label = proposed.revision ?? nextLabel(match?.current ?? null);
		if (match) this.title = match.title;
	}

	/** The registered drawing this file is a new revision of, if its number is known. */
	get match(): ExistingDrawing | undefined {
		const wanted = this.number.trim().toUpperCase();
		return this.existing.find((d) => d.number.toUpperCase() === wanted);
	}

	get problem(): string {
		if (!this.number.trim()) return 'Enter the drawing number.';
		if (!/^[A-Za-z0-9][A-Za-z0-9.-]{0,7}$/.test(this.label.trim()))
			return 'Enter a revision label such as 0, 1, A or B.';
		const match = this.match;
		if (match?.labels.some((l) => l.toUpperCase() === this.label.trim().toUpperCase())) {
			return `${match.number} already has revision ${this.label.trim().toUpperCase()}.`;
		}
		return '';
	}

	upload(projectId: number): Promise<void> {
		const match = this.match;
		const form = new FormData();
		if (match) {
			form.set('label', this.label.trim());
			form.set('note', this.note);
		} else {
			form.set('number', this.number.trim());
			form.set('title', this.title);
			form.set('kind', this.kind);
			form.set('line', this.line);
			form.set('area', this.area);
			form.set('system', this.system);
			form.set('revision', this.label.trim());
			form.set('note', this.note);
		}
		form.set('file', this.file, this.file.name);
		const url = match
			? `/api/projects/${projectId}/drawings/${match.id}/revisions`
			: `/api/projects/${projectId}/drawings`;
		this.status = 'uploading';
		this.progress = 0;
		this.message = '';
		return new Promise((resolve) => {
			const xhr = new XMLHttpRequest();
			xhr.open('POST', url);
			xhr.responseType = 'json';
			xhr.upload.onprogress = (e) => {
				if (e.lengthComputable) this.progress = e.loaded / e.total;
			};
			xhr.upload.onload = () => {
				this.progress = 1;
				this.status = 'processing';
			};
			xhr.onload = () => {
				const body = xhr.response as {
					error?: string;
					drawing?: { id: number };
					revision?: { id: number; label: string };
					pinsCarried?: number;
					pinsInPlace?: number | null;
					pinsMoved?: number | null;
					pinsFlagged?: number | null;
				} | null;
				if (xhr.status === 201 && body?.revision) {
					this.status = 'done';
					this.revisionId = body.revision.id;
					const drawingId = body.drawing?.id ?? match!.id;
					this.resultHref = `/projects/${projectId}/drawings/${drawingId}`;
					this.message = match
						? `Revision ${body.revision.label} is now current; the previous one is superseded.${carriedText(body)}`
						: `Registered with revision ${body.revision.label}.`;
				} else {
					this.status = 'failed';
					this.message = body?.error ?? statusText(xhr.status);
				}
				resolve();
			};
			xhr.onerror = () => {
				this.status = 'failed';
				this.message =
					'The connection was lost during the upload. Check the network and try again.';
				resolve();
			};
			xhr.send(form);
		});
	}
}
