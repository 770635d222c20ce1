/**
 * Password hashes with scrypt from Node's own crypto, at the cost OWASP's password storage
 * cheat sheet gives for scrypt (N = 2^17, r = 8, p = 1). The parameters travel in the hash,
 * so they can be raised later without breaking stored ones.
 */
import crypto from 'node:crypto';
import { promisify } from 'node:util';

const scrypt = promisify(crypto.scrypt) as (
	password: string,
	salt: Buffer,
	keylen: number,
	options: crypto.ScryptOptions
) => Promise<Buffer>;

const COST = { N: 2 ** 17, r: 8, p: 1 };
const KEY_LENGTH = 32;

function options(N: number, r: number, p: number): crypto.ScryptOptions {
	return { N, r, p, maxmem: 256 * N * r + 16 * 1024 * 1024 };
}

export async function hashPassword(password: string): Promise<string> {
	const salt = crypto.randomBytes(16);
	const key = await scrypt(password, salt, KEY_LENGTH, options(COST.N, COST.r, COST.p));
	return ['scrypt', COST.N, COST.r, COST.p, salt.toString('base64'), key.toString('base64')].join(
		'$'
	);
}

export async function verifyPassword(password: string, stored: string | null): Promise<boolean> {
	const parts = stored?.split('$') ?? [];
	if (parts.length !== 6 || parts[0] !== 'scrypt') return false;
	const [N, r, p] = parts.slice(1, 4).map(Number);
	const salt = Buffer.from(parts[4], 'base64');
	const expected = Buffer.from(parts[5], 'base64');
	const key = await scrypt(password, salt, expected.length, options(N, r, p));
	return crypto.timingSafeEqual(key, expected);
}
