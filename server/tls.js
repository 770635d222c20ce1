// The server's own https (server.js): a PEM certificate and key named in the environment.
import fs from 'node:fs';

/**
 * The certificate and key named by TLS_CERT and TLS_KEY (PEM files), or null to serve plain
 * http (on this machine, or behind a reverse proxy that serves https).
 */
export function tlsOptions(env = process.env) {
	const certPath = env.TLS_CERT?.trim();
	const keyPath = env.TLS_KEY?.trim();
	if (!certPath && !keyPath) return null;
	if (!certPath || !keyPath)
		throw new Error('Set both TLS_CERT and TLS_KEY (PEM files) to serve https, or neither.');
	return { cert: fs.readFileSync(certPath), key: fs.readFileSync(keyPath) };
}
