// `npm run tiles:backfill`: prepares the tiles of every revision stored before tiles existed
// (new uploads get theirs at once; a revision without them also gets them on its first
// view). `-- --retry` also tries the sheets that failed before. Safe to run beside the
// server; best while it is quiet, since rendering takes a core.
import { applyDefaults } from './env.js';

applyDefaults();
const retry = process.argv.includes('--retry');
const { getDb, schema } = await import('../src/lib/server/db/index');
const tiles = await import('../src/lib/server/tiles');
const { inArray, sql } = await import('drizzle-orm');

const db = getDb();
const revisions = tiles.missing(retry);
if (revisions.length === 0) {
	console.log('Every sheet already has its tiles; nothing to prepare.');
	process.exit(0);
}
const started = Date.now();
for (const revisionId of revisions) {
	if (retry) tiles.queue(revisionId);
	else tiles.ensure(revisionId);
}

function counts() {
	const row = db
		.select({
			total: sql<number>`count(*)`,
			done: sql<number>`coalesce(sum(${schema.sheetTiles.status} = 'done'), 0)`,
			failed: sql<number>`coalesce(sum(${schema.sheetTiles.status} = 'failed'), 0)`
		})
		.from(schema.sheetTiles)
		.where(inArray(schema.sheetTiles.revisionId, revisions))
		.get();
	return row ?? { total: 0, done: 0, failed: 0 };
}

let finished = false;
void tiles.idle().then(() => (finished = true));
while (!finished) {
	await new Promise((resolve) => setTimeout(resolve, 2000));
	const { total, done, failed } = counts();
	console.log(`Preparing sheets ${done + failed}/${total}${failed ? ` (${failed} failed)` : ''}`);
}
const { total, done, failed } = counts();
const seconds = ((Date.now() - started) / 1000).toFixed(0);
console.log(
	`${done} of ${total} sheets of ${revisions.length} revisions prepared in ${seconds} s` +
		(failed ? `; ${failed} failed (they open with pdf.js; see sheet_tiles.error)` : '.')
);
process.exit(failed ? 1 : 0);
