import { defineConfig } from 'drizzle-kit';
import { DEFAULT_DATABASE_URL } from './server/defaults.js';

export default defineConfig({
	schema: './src/lib/server/db/schema.ts',
	out: './drizzle',
	dialect: 'sqlite',
	dbCredentials: { url: process.env.DATABASE_URL || DEFAULT_DATABASE_URL },
	strict: true,
	verbose: true
});
