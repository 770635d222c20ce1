/** Dates and times as the site reads them: day first, 24-hour clock, in the viewer's zone. */
export function formatTime(ms: number): string {
	return new Date(ms).toLocaleString('en-GB', {
		day: '2-digit',
		month: 'short',
		year: 'numeric',
		hour: '2-digit',
		minute: '2-digit'
	});
}

export function formatDate(ms: number): string {
	return new Date(ms).toLocaleDateString('en-GB', {
		day: '2-digit',
		month: 'short',
		year: 'numeric'
	});
}

/** A calendar day as stored (`2026-10-09`, a weld date) in the same words: the day itself, in no zone. */
export function formatDay(day: string): string {
	return new Date(`${day}T00:00:00Z`).toLocaleDateString('en-GB', {
		day: '2-digit',
		month: 'short',
		year: 'numeric',
		timeZone: 'UTC'
	});
}
