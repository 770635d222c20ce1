// `npm run db:migrate`: apply the migrations in drizzle/ to DATABASE_URL.
import { applyDefaults } from './env.js';

applyDefaults();
const { getDb } = await import('../src/lib/server/db/index');
getDb();
console.log(`Migrations applied to ${process.env.DATABASE_URL}`);
