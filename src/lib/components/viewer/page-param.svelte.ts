/**
 * Keeps `?page=N` (1-based) and the viewer's sheet in step, so a link or a reload opens the
 * same sheet. Call during component initialisation.
 */
import { untrack } from 'svelte';
import { afterNavigate, replaceState } from '$app/navigation';
import { page } from '$app/state';
import type { SheetViewport } from './viewport.svelte';

export function syncPageParam(viewport: SheetViewport): void {
	// replaceState throws until the router has started, which is after the first effects run.
	let routerStarted = $state(false);
	afterNavigate(() => {
		routerStarted = true;
	});

	$effect(() => {
		const asked = Number(page.url.searchParams.get('page') ?? '1');
		untrack(() => viewport.goTo(asked));
	});

	$effect(() => {
		const pageNumber = viewport.pageNumber;
		if (!routerStarted) return;
		// page.url does not follow replaceState (shallow routing), the address bar does.
		const url = new URL(location.href);
		const inUrl = url.searchParams.get('page');
		if (inUrl === String(pageNumber) || (inUrl === null && pageNumber === 1)) return;
		url.searchParams.set('page', String(pageNumber));
		untrack(() => replaceState(url, page.state));
	});
}
