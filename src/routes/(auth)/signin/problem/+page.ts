import type { PageLoad } from './$types';

/** Auth.js sends its errors here, e.g. a sign-in link that was used or has expired. */
export const load = (({ url }) => {
	const code = url.searchParams.get('error') ?? '';
	const text: Record<string, string> = {
		Verification: 'This sign-in link has expired or was already used. Ask for a new one.',
		AccessDenied: 'This account cannot sign in. Ask your project’s administrator.',
		Configuration: 'Sign-in is not set up correctly on this server. Tell your administrator.'
	};
	return {
		title: 'Sign-in problem',
		message: text[code] ?? 'Signing in did not work. Please try again.'
	};
}) satisfies PageLoad;
