// `npm run seed`: seed an empty database (the demo job, or only the administrator with
// TACKSHEET_DEMO=0). A database that already has users is left as it is.
import { applyDefaults } from './env.js';

applyDefaults();
const { getDb } = await import('../src/lib/server/db/index');
const { seedIfEmpty } = await import('../src/lib/server/demo/seed');
const result = await seedIfEmpty(getDb());
console.log(
	result.seeded
		? `Seeded ${result.users} users, ${result.projects} projects, ${result.drawings} drawings, ${result.joints} joints into ${process.env.DATABASE_URL}.`
		: `${process.env.DATABASE_URL} already has ${result.users} users; nothing seeded.`
);
