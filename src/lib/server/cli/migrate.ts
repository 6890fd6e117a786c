import { closeDb, migrate } from '../db';

const applied = await migrate();
console.log(
	applied.length ? `Applied migrations: ${applied.join(', ')}` : 'Database is up to date.'
);
await closeDb();
