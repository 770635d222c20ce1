import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import https from 'node:https';
import { execFileSync } from 'node:child_process';
import { describe, expect, it } from 'vitest';
import { tlsOptions } from '../../server/tls.js';

/** The server's own https: TLS_CERT and TLS_KEY name PEM files, both or neither. */
describe('serving https from TLS_CERT and TLS_KEY', () => {
	it('serves plain http when neither is set, and refuses only one of the two', () => {
		expect(tlsOptions({})).toBeNull();
		expect(tlsOptions({ TLS_CERT: ' ', TLS_KEY: '' })).toBeNull();
		expect(() => tlsOptions({ TLS_CERT: 'server.crt' })).toThrow(/both TLS_CERT and TLS_KEY/);
	});

	it('answers over https with a certificate made by openssl as the README shows', async () => {
		const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'tacksheet-tls-'));
		const cert = path.join(dir, 'server.crt');
		const key = path.join(dir, 'server.key');
		execFileSync('openssl', [
			'req',
			'-x509',
			'-newkey',
			'rsa:2048',
			'-nodes',
			'-days',
			'1',
			'-subj',
			'/CN=localhost',
			'-keyout',
			key,
			'-out',
			cert
		]);
		const options = tlsOptions({ TLS_CERT: cert, TLS_KEY: key })!;
		const server = https.createServer(options, (_req, res) => res.end('ok'));
		await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
		const { port } = server.address() as { port: number };
		const body = await new Promise<string>((resolve, reject) => {
			https
				.get(
					{
						host: '127.0.0.1',
						port,
						path: '/',
						ca: fs.readFileSync(cert),
						servername: 'localhost'
					},
					(res) => {
						let text = '';
						res.on('data', (c) => (text += c));
						res.on('end', () => resolve(text));
					}
				)
				.on('error', reject);
		});
		server.close();
		fs.rmSync(dir, { recursive: true, force: true });
		expect(body).toBe('ok');
	});
});
