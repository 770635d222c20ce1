// Drawing uploads, streamed to disk with multer before SvelteKit sees the request: SvelteKit
// (and adapter-node's body limit) would hold the whole body in memory. The middleware asks
// the app first whether the caller may upload (the same hooks and permissions as every other
// route), streams the file to a temporary place while hashing it, then hands the app a
// single-use reference to the staged file instead of the body. Used by server.js in
// production and by a Vite plugin in development.
import crypto from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import multer from 'multer';
import { photoMaxMb } from './defaults.js';

/** @typedef {import('node:http').IncomingMessage & { file?: StagedFile, body?: Record<string, string> }} UploadRequest */
/** @typedef {import('node:http').ServerResponse} Response */
/** @typedef {{ path: string, size: number, sha256: string, originalname: string }} StagedFile */
/** @typedef {{ tempPath: string, bytes: number, sha256: string, originalName: string, createdAt: number }} Staged */
/** @typedef {{ pattern: RegExp, permit: (m: RegExpExecArray) => string, kind?: 'pdf' | 'photo' }} UploadRoute */

/** @type {UploadRoute[]} */
const ROUTES = [
	{
		pattern: /^\/api\/projects\/(\d+)\/drawings\/?$/,
		permit: (m) => `/api/projects/${m[1]}/upload-permit`
	},
	{
		pattern: /^\/api\/projects\/(\d+)\/drawings\/(\d+)\/revisions\/?$/,
		permit: (m) => `/api/projects/${m[1]}/upload-permit?drawing=${m[2]}`
	},
	// A photo's bytes are judged by the app (it decodes them); only its size is bounded here.
	{
		pattern: /^\/api\/inspections\/(\d+)\/photos\/?$/,
		permit: (m) => `/api/inspections/${m[1]}/photo-permit`,
		kind: 'photo'
	}
];

const STAGED_TTL_MS = 10 * 60_000;
const PDF_MAGIC = Buffer.from('%PDF-');

/** The files staged for the app, by single-use token; shared with the app in this process. */
function registry() {
	const holder = /** @type {{ tacksheetStagedUploads?: Map<string, Staged> }} */ (globalThis);
	holder.tacksheetStagedUploads ??= new Map();
	return holder.tacksheetStagedUploads;
}

class UploadError extends Error {
	/**
	 * @param {number} status
	 * @param {string} message
	 */
	constructor(status, message) {
		super(message);
		this.status = status;
	}
}

/**
 * @param {Response} res
 * @param {number} status
 * @param {unknown} body
 */
function sendJson(res, status, body) {
	if (res.headersSent) return;
	// The connection stays open while the rest of a refused body is read and thrown away, so the
	// client is still listening when it has finished sending and reads the answer.
	res.writeHead(status, { 'content-type': 'application/json' });
	res.end(JSON.stringify(body));
}

/**
 * Multer storage that writes to a temporary file, hashes while writing and checks the magic bytes
 * of a PDF (a photo is checked by the app, which decodes it).
 * @param {string} tmpDir
 * @param {boolean} [pdf]
 * @returns {import('multer').StorageEngine}
 */
function stagingStorage(tmpDir, pdf = true) {
	return {
		_handleFile(_req, file, callback) {
			const tempPath = path.join(tmpDir, `${crypto.randomUUID()}.part`);
			const hash = crypto.createHash('sha256');
			const out = fs.createWriteStream(tempPath, { flags: 'wx' });
			let head = Buffer.alloc(0);
			let bytes = 0;
			let failed = false;
			/** @param {Error} error */
			const fail = (error) => {
				if (failed) return;
				failed = true;
				file.stream.unpipe?.();
				file.stream.resume();
				out.destroy();
				fs.rm(tempPath, { force: true }, () => callback(error));
			};
			file.stream.on('data', (/** @type {Buffer} */ chunk) => {
				bytes += chunk.length;
				hash.update(chunk);
				if (head.length < 1024) {
					head = Buffer.concat([head, chunk]).subarray(0, 1024);
					// The PDF header may follow a few bytes of junk, but must come within the first 1 KB.
					if (pdf && head.length === 1024 && head.indexOf(PDF_MAGIC) < 0) {
						fail(new UploadError(415, 'That file is not a PDF. Upload the drawing as a PDF file.'));
					}
				}
			});
			file.stream.on('error', fail);
			out.on('error', fail);
			out.on('finish', () => {
				if (failed) return;
				if (pdf && head.indexOf(PDF_MAGIC) < 0) {
					return fail(
						new UploadError(415, 'That file is not a PDF. Upload the drawing as a PDF file.')
					);
				}
				callback(
					null,
					/** @type {Partial<Express.Multer.File>} */ ({
						path: tempPath,
						size: bytes,
						sha256: hash.digest('hex')
					})
				);
			});
			file.stream.pipe(out);
		},
		_removeFile(_req, file, callback) {
			fs.rm(file.path, { force: true }, () => callback(null));
		}
	};
}

/** @param {UploadRequest} req */
function expectedOrigin(req) {
	return process.env.ORIGIN || `http://${req.headers.host}`;
}

/**
 * A request that signs in with a Bearer token alone. Any other Authorization scheme, or a
 * cookie beside the token, is treated as a browser's request.
 * @param {UploadRequest} req
 */
function tokenOnly(req) {
	return /^Bearer \S+$/.test(req.headers.authorization ?? '') && !req.headers.cookie;
}

/**
 * Forward the caller's credentials, nothing else, to the app's own routes.
 * @param {UploadRequest} req
 */
function credentials(req) {
	/** @type {Record<string, string>} */
	const headers = {};
	if (req.headers.cookie) headers.cookie = req.headers.cookie;
	if (req.headers.authorization) headers.authorization = req.headers.authorization;
	return headers;
}

/**
 * The write's Idempotency-Key, passed on with the staged file so a photo sent twice is stored once.
 * @param {UploadRequest} req
 */
function idempotencyKey(req) {
	/** @type {Record<string, string>} */
	const headers = {};
	const key = req.headers['idempotency-key'];
	if (typeof key === 'string') headers['idempotency-key'] = key;
	return headers;
}

/**
 * @param {globalThis.Response} response
 * @param {Response} res
 */
async function relay(response, res) {
	const body = await response.text();
	res.writeHead(response.status, {
		'content-type': response.headers.get('content-type') ?? 'application/json'
	});
	res.end(body);
}

/**
 * @param {{ uploadsDir: string, maxMb: number, photoMb?: number }} options
 * @returns {(req: import('node:http').IncomingMessage, res: import('node:http').ServerResponse, next: () => void) => void}
 */
export function createUploadStage({ uploadsDir, maxMb, photoMb = photoMaxMb() }) {
	const tmpDir = path.join(path.resolve(uploadsDir), 'tmp');
	fs.mkdirSync(tmpDir, { recursive: true });
	// Anything left from a crash is unfinished; nobody holds a reference to it.
	for (const name of fs.readdirSync(tmpDir)) fs.rmSync(path.join(tmpDir, name), { force: true });
	const maxBytes = maxMb * 1024 * 1024;
	const upload = multer({
		storage: stagingStorage(tmpDir),
		limits: { fileSize: maxBytes, files: 1, fields: 20, fieldSize: 64 * 1024, parts: 24 }
	}).single('file');
	const photoBytes = photoMb * 1024 * 1024;
	const uploadPhoto = multer({
		storage: stagingStorage(tmpDir, false),
		limits: { fileSize: photoBytes, files: 1, fields: 20, fieldSize: 64 * 1024, parts: 24 }
	}).single('file');

	setInterval(() => {
		const now = Date.now();
		for (const [token, staged] of registry()) {
			if (now - staged.createdAt > STAGED_TTL_MS) {
				registry().delete(token);
				fs.rm(staged.tempPath, { force: true }, () => {});
			}
		}
	}, 60_000).unref();

	/**
	 * @param {UploadRequest} req
	 * @param {Response} res
	 * @param {() => void} next
	 */
	return function uploadStage(req, res, next) {
		const pathname = (req.url ?? '').split('?')[0];
		const route = req.method === 'POST' ? ROUTES.find((r) => r.pattern.test(pathname)) : undefined;
		const type = req.headers['content-type'] ?? '';
		if (!route || !type.startsWith('multipart/form-data')) return next();
		handle(req, res, route, pathname).catch((error) => {
			console.error('Upload failed:', error);
			sendJson(res, 500, {
				error:
					'The upload failed on the server. Try again; if it keeps failing, tell your administrator.'
			});
		});
	};

	/**
	 * @param {UploadRequest} req
	 * @param {Response} res
	 * @param {UploadRoute} route
	 * @param {string} pathname
	 */
	async function handle(req, res, route, pathname) {
		// Under TLS (server.js), the app is asked through its plain loopback listener.
		const self =
			/** @type {{ tacksheetSelfOrigin?: string }} */ (globalThis).tacksheetSelfOrigin ??
			`http://127.0.0.1:${req.socket.localPort}`;
		const drain = () => req.resume();
		// Browsers send their session cookie cross-site too; only our own pages may post with it.
		// A script with a personal API token and no cookie has no origin to check (the permit
		// below checks the token itself).
		if (!tokenOnly(req) && req.headers.origin !== expectedOrigin(req)) {
			drain();
			return sendJson(res, 403, {
				error: 'Cross-site upload refused: upload from Tacksheet itself.'
			});
		}
		const permit = await fetch(
			self + route.permit(/** @type {RegExpExecArray} */ (route.pattern.exec(pathname))),
			{
				headers: credentials(req),
				redirect: 'manual'
			}
		);
		if (permit.status !== 204) {
			drain();
			return relay(permit, res);
		}
		const photo = route.kind === 'photo';
		const limitMb = photo ? photoMb : maxMb;
		const declared = Number(req.headers['content-length']);
		if (Number.isFinite(declared) && declared > limitMb * 1024 * 1024 + 1024 * 1024) {
			drain();
			return sendJson(res, 413, { error: `The file is larger than the ${limitMb} MB limit.` });
		}

		/** @type {{ error?: unknown, file?: StagedFile, fields: Record<string, string> }} */
		const staged = await new Promise((resolve) => {
			(photo ? uploadPhoto : upload)(
				/** @type {import('express').Request} */ (/** @type {unknown} */ (req)),
				/** @type {import('express').Response} */ (/** @type {unknown} */ (res)),
				(/** @type {unknown} */ error) => resolve({ error, file: req.file, fields: req.body ?? {} })
			);
		});
		if (staged.error) {
			if (staged.file?.path) fs.rmSync(staged.file.path, { force: true });
			drain();
			if (staged.error instanceof UploadError)
				return sendJson(res, staged.error.status, { error: staged.error.message });
			if (staged.error instanceof multer.MulterError && staged.error.code === 'LIMIT_FILE_SIZE') {
				return sendJson(res, 413, { error: `The file is larger than the ${limitMb} MB limit.` });
			}
			const reason = staged.error instanceof Error ? staged.error.message : String(staged.error);
			return sendJson(res, 400, { error: `The upload could not be read: ${reason}.` });
		}
		if (!staged.file)
			return sendJson(res, 400, {
				error: photo
					? 'Attach the photo in the "file" field.'
					: 'Attach the drawing as a PDF in the "file" field.'
			});

		const token = crypto.randomBytes(24).toString('base64url');
		registry().set(token, {
			tempPath: staged.file.path,
			bytes: staged.file.size,
			sha256: staged.file.sha256,
			originalName: staged.file.originalname,
			createdAt: Date.now()
		});
		try {
			const response = await fetch(self + pathname, {
				method: 'POST',
				headers: {
					...credentials(req),
					...idempotencyKey(req),
					'content-type': 'application/json'
				},
				body: JSON.stringify({ staged: token, fields: { ...staged.fields } }),
				redirect: 'manual'
			});
			await relay(response, res);
		} finally {
			// Whatever the app did, the staged file is gone or adopted by now.
			const left = registry().get(token);
			if (left) {
				registry().delete(token);
				fs.rmSync(left.tempPath, { force: true });
			}
		}
	}
}
