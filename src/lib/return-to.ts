/** A return address after sign-in: a path on this site only, never another site. */
export function safeReturnTo(value: string | null | undefined, fallback = '/projects'): string {
	if (!value || !value.startsWith('/') || value.startsWith('//') || value.startsWith('/\\'))
		return fallback;
	if (value.startsWith('/signin') || value.startsWith('/signout') || value.startsWith('/auth/'))
		return fallback;
	return value;
}
