// The server for the browser tests: a fresh database and upload folder on every run.
import fs from 'node:fs';
import path from 'node:path';

const dataDir = path.dirname(path.resolve(process.env.DATABASE_URL || 'test-results/e2e-4173/x'));
fs.rmSync(dataDir, { recursive: true, force: true });
await import('./start.js');
