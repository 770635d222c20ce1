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
