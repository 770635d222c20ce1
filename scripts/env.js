// Settings for `npm start` and the scripts, so the app runs with no .env at all: a port,
// the origin the browser will use (adapter-node's form-post check needs it), and a secret
// for sign-in generated once and kept in the data folder.
import crypto from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { DEFAULT_DATABASE_URL, DEFAULT_UPLOADS_DIR } from '../server/defaults.js';

function loadDotEnv(file = '.env') {
	if (!fs.existsSync(file)) return;
	for (const line of fs.readFileSync(file, 'utf8').split(/\r?\n/)) {
		const match = /^\s*([A-Z0-9_]+)\s*=\s*(.*?)\s*$/.exec(line);
		if (!match || line.trim().startsWith('#')) continue;
		const value = match[2].replace(/^(['"])(.*)\1$/, '$2');
		process.env[match[1]] ??= value;
	}
}

function isLocal(origin) {
	try {
		return ['localhost', '127.0.0.1', '[::1]'].includes(new URL(origin).hostname);
	} catch {
		return false;
	}
}

export function applyDefaults() {
	loadDotEnv();
	const env = process.env;
	env.PORT ||= '3000';
	env.ORIGIN ||= `http://localhost:${env.PORT}`;
	env.DATABASE_URL ||= DEFAULT_DATABASE_URL;
	env.UPLOADS_DIR ||= DEFAULT_UPLOADS_DIR;
	const dataDir = path.dirname(path.resolve(env.DATABASE_URL));
	if (!env.AUTH_SECRET) {
		if (!isLocal(env.ORIGIN)) {
			throw new Error(
				`AUTH_SECRET is required when Tacksheet is served at ${env.ORIGIN}: generate one with "openssl rand -base64 33".`
			);
		}
		const file = path.join(dataDir, 'auth-secret');
		fs.mkdirSync(dataDir, { recursive: true });
		if (!fs.existsSync(file)) {
			fs.writeFileSync(file, crypto.randomBytes(33).toString('base64'), { mode: 0o600 });
		}
		env.AUTH_SECRET = fs.readFileSync(file, 'utf8').trim();
	}
	return env;
}
