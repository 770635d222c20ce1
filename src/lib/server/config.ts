/**
 * Runtime settings, read from the environment once. Plain `process.env` rather than
 * `$env/dynamic/private` so the same modules run under `npm run seed` and the tests.
 */
import path from 'node:path';
import {
	DEFAULT_DATABASE_URL,
	DEFAULT_UPLOADS_DIR,
	uploadMaxMb
} from '../../../server/defaults.js';

function flag(value: string | undefined, fallback: boolean): boolean {
	if (value === undefined || value === '') return fallback;
	return !['0', 'false', 'no', 'off'].includes(value.toLowerCase());
}

/** Whole days, 0 or more; anything else falls back. */
function days(value: string | undefined, fallback: number): number {
	if (value === undefined || value.trim() === '') return fallback;
	const n = Number(value);
	return Number.isInteger(n) && n >= 0 ? n : fallback;
}

/** A whole number from 1; anything else falls back. */
function count(value: string | undefined, fallback: number): number {
	const n = Number(value);
	return Number.isInteger(n) && n >= 1 ? n : fallback;
}

export const config = {
	databaseUrl: process.env.DATABASE_URL || DEFAULT_DATABASE_URL,
	uploadsDir: path.resolve(process.env.UPLOADS_DIR || DEFAULT_UPLOADS_DIR),
	/** Where the local secret and other machine-local state live. */
	dataDir: path.resolve(
		process.env.DATA_DIR || path.dirname(process.env.DATABASE_URL || './data/x')
	),
	migrationsDir: path.resolve(process.env.MIGRATIONS_DIR || './drizzle'),
	demo: flag(process.env.TACKSHEET_DEMO, true),
	adminEmail: process.env.ADMIN_EMAIL || '',
	adminPassword: process.env.ADMIN_PASSWORD || '',
	smtpUrl: process.env.SMTP_URL || '',
	mailFrom: process.env.MAIL_FROM || 'Tacksheet <no-reply@tacksheet.test>',
	uploadMaxMb: uploadMaxMb(),
	/** Most pages an uploaded drawing may have; a set of sheets larger than this is split. */
	uploadMaxPages: count(process.env.UPLOAD_MAX_PAGES, 500),
	/** Longest time the check of one uploaded PDF may take before it is refused. */
	uploadCheckSeconds: count(process.env.UPLOAD_CHECK_SECONDS, 120),
	/** Days a finished turnover zip is kept; 0 keeps every zip until a person removes it. */
	exportKeepDays: days(process.env.EXPORT_KEEP_DAYS, 30),
	/** Hours an invitation's link works (a sign-in link asked for on the sign-in page: 30 minutes). */
	inviteHours: count(process.env.INVITE_HOURS, 72),
	/** Minutes a freshly placed joint with no record can be taken back (Undo); 0 never. */
	undoPlaceMinutes: days(process.env.UNDO_PLACE_MINUTES, 10)
};
