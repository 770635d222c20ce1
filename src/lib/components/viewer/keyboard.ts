/** Keyboard shortcuts of the sheet viewers: one table drives both the handler and the help. */
import type { SheetViewport } from './viewport.svelte';

interface Shortcut {
	keys: string[];
	/** How the keys are written in the help list. */
	shown: string[];
	does: string;
	run: (viewport: SheetViewport, key: string) => void;
}

/** A pan step, as a share of the smaller side of the frame; positive moves the sheet right or down. */
const PAN = 0.15;
const PANS: Record<string, [number, number]> = {
	ArrowLeft: [PAN, 0],
	ArrowRight: [-PAN, 0],
	ArrowUp: [0, PAN],
	ArrowDown: [0, -PAN]
};

export const SHORTCUTS: readonly Shortcut[] = [
	{ keys: ['+', '='], shown: ['+', '='], does: 'Zoom in', run: (v) => v.zoomIn() },
	{ keys: ['-', '_'], shown: ['−'], does: 'Zoom out', run: (v) => v.zoomOut() },
	{ keys: ['0'], shown: ['0'], does: 'Fit the sheet on screen', run: (v) => v.fitPage() },
	{ keys: ['w', 'W'], shown: ['W'], does: 'Fit the sheet width', run: (v) => v.fitWidth() },
	{ keys: ['PageDown', ']'], shown: ['Page Down', ']'], does: 'Next sheet', run: (v) => v.next() },
	{
		keys: ['PageUp', '['],
		shown: ['Page Up', '['],
		does: 'Previous sheet',
		run: (v) => v.previous()
	},
	{
		keys: ['ArrowLeft', 'ArrowRight', 'ArrowUp', 'ArrowDown'],
		shown: ['←', '→', '↑', '↓'],
		does: 'Move around the sheet',
		run: (v, key) => v.panBy(...PANS[key])
	}
];

function isTyping(target: EventTarget | null): boolean {
	if (!(target instanceof HTMLElement)) return false;
	return target.isContentEditable || /^(INPUT|TEXTAREA|SELECT)$/.test(target.tagName);
}

/**
 * Runs the shortcut for a key press, if any. Presses with Ctrl, Alt or Cmd belong to the
 * browser (Ctrl + zooms the page), and keys typed into a field belong to the field.
 * Returns true when the key was used, so the caller can stop the page from scrolling.
 */
export function runShortcut(
	event: KeyboardEvent,
	viewport: SheetViewport,
	toggleHelp: () => void
): boolean {
	if (event.ctrlKey || event.metaKey || event.altKey || event.defaultPrevented) return false;
	if (isTyping(event.target)) return false;
	if (event.key === '?') {
		toggleHelp();
		return true;
	}
	const shortcut = SHORTCUTS.find((s) => s.keys.includes(event.key));
	if (!shortcut) return false;
	shortcut.run(viewport, event.key);
	return true;
}
