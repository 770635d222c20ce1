// Preloaded into a bench server (`node --import`): measures the server's own event-loop stalls
// with perf_hooks.monitorEventLoopDelay. On SIGUSR2 it writes the figures since the last
// signal to LOOP_DELAY_FILE and starts afresh, so the bench can bracket one job exactly.
import fs from 'node:fs';
import { monitorEventLoopDelay } from 'node:perf_hooks';

const file = process.env.LOOP_DELAY_FILE;
if (file) {
	const histogram = monitorEventLoopDelay({ resolution: 10 });
	histogram.enable();
	let seq = 0;
	process.on('SIGUSR2', () => {
		const ms = (ns) => ns / 1e6;
		const figures = {
			seq: ++seq,
			count: histogram.count,
			p50: ms(histogram.percentile(50)),
			p99: ms(histogram.percentile(99)),
			max: ms(histogram.max)
		};
		fs.writeFileSync(`${file}.part`, JSON.stringify(figures));
		fs.renameSync(`${file}.part`, file);
		histogram.reset();
	});
}
