/** The date on a revision block (`YYYY-MM-DD`), written the way the site reads dates. */
export function formatIssuedOn(issuedOn: string | null): string | null {
	if (!issuedOn) return null;
	const at = Date.parse(`${issuedOn}T00:00:00Z`);
	if (Number.isNaN(at)) return issuedOn;
	// UTC on both sides: the date on the sheet must not move with the viewer's time zone.
	return new Date(at).toLocaleDateString('en-GB', {
		day: '2-digit',
		month: 'short',
		year: 'numeric',
		timeZone: 'UTC'
	});
}
