// The production server: SvelteKit's adapter-node handler on a plain Node http server, with
// drawing uploads streamed to disk in front of it (server/upload-stage.js), since SvelteKit
// and adapter-node's body limit would hold a whole upload in memory.
import http from 'node:http';
import https from 'node:https';
import { createUploadStage } from './server/upload-stage.js';
import { tlsOptions } from './server/tls.js';
import { DEFAULT_UPLOADS_DIR, uploadMaxMb } from './server/defaults.js';

const BASELINE_HEADERS = {
	'x-content-type-options': 'nosniff',
	'referrer-policy': 'same-origin',
	'x-frame-options': 'DENY',
	// Only framing: the pdf.js worker is a static file, and a worker runs under its own file's
	// policy, so anything stricter here would stop it fetching its fonts and decoders.
	'content-security-policy': "frame-ancestors 'none'"
};

export async function startServer() {
	const { handler } = await import('./build/handler.js');
	const stage = createUploadStage({
		uploadsDir: process.env.UPLOADS_DIR || DEFAULT_UPLOADS_DIR,
		maxMb: uploadMaxMb()
	});
	const port = Number(process.env.PORT || 3000);
	const host = process.env.HOST || '0.0.0.0';
	/** @type {import('node:http').RequestListener} */
	const listener = (req, res) => {
		// Every answer, the static files and the upload stage's too, carries these; SvelteKit's
		// own headers (a page's Content-Security-Policy) replace them where it sets one.
		for (const [name, value] of Object.entries(BASELINE_HEADERS)) res.setHeader(name, value);
		stage(req, res, () => handler(req, res));
	};
	const tls = tlsOptions();
	const server = tls ? https.createServer(tls, listener) : http.createServer(listener);
	if (tls) {
		// The upload stage asks the app itself over loopback: a plain listener on 127.0.0.1 only.
		const inside = http.createServer(listener);
		await new Promise((resolve) => inside.listen(0, '127.0.0.1', () => resolve(undefined)));
		const address = /** @type {import('node:net').AddressInfo} */ (inside.address());
		/** @type {{ tacksheetSelfOrigin?: string }} */ (globalThis).tacksheetSelfOrigin =
			`http://127.0.0.1:${address.port}`;
		inside.unref();
	}
	// Big drawings over a site connection take a while: no request timeout, but idle sockets close.
	server.requestTimeout = 0;
	server.headersTimeout = 60_000;
	await new Promise((resolve, reject) => {
		server.once('error', reject);
		server.listen(port, host, () => resolve(undefined));
	});
	const stop = () => {
		server.close(() => process.exit(0));
		setTimeout(() => process.exit(0), 5000).unref();
	};
	process.once('SIGTERM', stop);
	process.once('SIGINT', stop);
	return server;
}
