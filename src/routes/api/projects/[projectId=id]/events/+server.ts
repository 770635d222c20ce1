import * as events from '$lib/server/events';
import type { RequestHandler } from './$types';

/**
 * Server-sent events for changes in the project: each is one `data:` line of JSON. A comment
 * every 25 s keeps proxies from closing a quiet stream.
 */
export const GET: RequestHandler = ({ locals, request }) => {
	const projectId = locals.projectId!;
	const encoder = new TextEncoder();
	let stop = () => {};
	const stream = new ReadableStream<Uint8Array>({
		start(controller) {
			const send = (text: string) => {
				try {
					controller.enqueue(encoder.encode(text));
				} catch {
					stop();
				}
			};
			send('retry: 3000\n: connected\n\n');
			const unsubscribe = events.subscribe(projectId, (event) =>
				send(`data: ${JSON.stringify(event)}\n\n`)
			);
			const keepAlive = setInterval(() => send(': keep-alive\n\n'), 25_000);
			stop = () => {
				clearInterval(keepAlive);
				unsubscribe();
			};
			request.signal.addEventListener('abort', () => {
				stop();
				try {
					controller.close();
				} catch {
					// already closed
				}
			});
		},
		cancel() {
			stop();
		}
	});
	return new Response(stream, {
		headers: {
			'content-type': 'text/event-stream',
			'cache-control': 'no-store',
			'x-accel-buffering': 'no'
		}
	});
};
