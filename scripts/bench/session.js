// Signing in to a bench server the way a script would.
export async function signIn(origin, email, password = 'tacksheet-demo') {
	const response = await fetch(`${origin}/auth/callback/credentials`, {
		method: 'POST',
		headers: { origin, 'content-type': 'application/x-www-form-urlencoded' },
		body: new URLSearchParams({ email, password, callbackUrl: '/' }),
		redirect: 'manual'
	});
	const cookie = response.headers
		.getSetCookie()
		.map((c) => c.split(';')[0])
		.join('; ');
	if (!cookie.includes('session-token')) throw new Error(`bench sign-in of ${email} failed`);
	return cookie;
}
