// The production server: SvelteKit's adapter-node handler on a plain Node http server.
// Kept as our own entry so routes that must skip SvelteKit (streamed uploads) can be added
// in front of the handler, and so shutdown is orderly.
import http from 'node:http';

export async function startServer() {
	const { handler } = await import('./build/handler.js');
	const port = Number(process.env.PORT || 3000);
	const host = process.env.HOST || '0.0.0.0';
	const server = http.createServer((req, res) => handler(req, res));
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
