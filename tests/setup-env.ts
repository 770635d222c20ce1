/**
 * Every test file gets its own real SQLite file and upload folder in a fresh temporary
 * directory, set before any app module reads its configuration.
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll } from 'vitest';

const root = fs.mkdtempSync(path.join(os.tmpdir(), 'tacksheet-test-'));
process.env.DATABASE_URL = path.join(root, 'tacksheet.db');
process.env.UPLOADS_DIR = path.join(root, 'uploads');
process.env.DATA_DIR = root;
process.env.AUTH_SECRET ??= 'test-secret-not-for-production-0123456789abcdef';
process.env.TACKSHEET_DEMO ??= '1';

afterAll(() => {
	fs.rmSync(root, { recursive: true, force: true });
});
