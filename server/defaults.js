// What Tacksheet runs with when the environment names nothing: one plain-JS module, read by
// the production server, the dev and preview servers, `npm start`, drizzle-kit and the app's
// own settings (src/lib/server/config.ts), so a default is never written twice.

/** Where the SQLite database lives (DATABASE_URL). */
export const DEFAULT_DATABASE_URL = './data/tacksheet.db';

/** Where drawings, turnover zips and staged uploads are stored (UPLOADS_DIR). */
export const DEFAULT_UPLOADS_DIR = './uploads';

/** The largest drawing upload, in megabytes (UPLOAD_MAX_MB). */
export const DEFAULT_UPLOAD_MAX_MB = 200;

/** A positive number of megabytes from the environment, or the default. */
export function uploadMaxMb(value = process.env.UPLOAD_MAX_MB) {
	const n = Number(value);
	return Number.isFinite(n) && n > 0 ? n : DEFAULT_UPLOAD_MAX_MB;
}

/** The largest photo upload, in megabytes (PHOTO_MAX_MB). */
export const DEFAULT_PHOTO_MAX_MB = 25;

/** A positive number of megabytes from the environment, or the default. */
export function photoMaxMb(value = process.env.PHOTO_MAX_MB) {
	const n = Number(value);
	return Number.isFinite(n) && n > 0 ? n : DEFAULT_PHOTO_MAX_MB;
}
