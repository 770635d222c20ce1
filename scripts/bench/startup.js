// First start on an empty database (migrate and seed the demo job), then an idle server.
import { rssMb, startBenchServer, timeRequests } from './server.js';

export async function run() {
	const server = await startBenchServer();
	try {
		console.log(
			`first start to healthy (build present, migrate + demo seed): ${server.readyMs.toFixed(0)} ms`
		);
		const health = await timeRequests(`${server.origin}/api/health`, 200);
		console.log(
			`GET /api/health over 200 requests: median ${health.median.toFixed(2)} ms, p95 ${health.p95.toFixed(2)} ms`
		);
		console.log(`server memory after start: ${rssMb(server.pid).toFixed(0)} MB RSS`);
	} finally {
		await server.stop();
	}
}
