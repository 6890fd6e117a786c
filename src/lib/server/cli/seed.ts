import { closeDb, migrate } from '../db';
import { seedDemo } from '../services/demo-seed';

await migrate();
const started = Date.now();
const summary = await seedDemo();
console.log(
	summary.seeded
		? `Demo fleet loaded: ${summary.vans} vans, ${summary.readings} readings, ${summary.events} events, ${summary.trips} trips (${((Date.now() - started) / 1000).toFixed(1)} s).`
		: 'The database already holds organisations; the demo fleet was not loaded.'
);
await closeDb();
