import { beforeAll, describe, expect, inject, it } from 'vitest';

let db: typeof import('../../src/lib/server/db');

beforeAll(async () => {
	process.env.DATABASE_URL = inject('databaseUrl');
	db = await import('../../src/lib/server/db');
	db.getDb();
});

const kind = inject('databaseUrl').startsWith('sqlite:') ? 'sqlite' : 'postgres';

describe(`the ${kind} database`, () => {
	it.runIf(kind === 'sqlite')('runs in WAL journal mode', async () => {
		const [rows] = await db.getDb().query('PRAGMA journal_mode');
		expect((rows as { journal_mode: string }[])[0].journal_mode).toBe('wal');
	});

	it('refuses a reading for a van that does not exist (foreign keys on)', async () => {
		await expect(
			db.Reading.create({
				vehicleId: 987654321,
				takenAt: new Date(),
				deltaPMbar: 120,
				condition: 'idle',
				source: 'manual'
			})
		).rejects.toThrow(/foreign key/i);
	});

	it('refuses the same foreign-key violation inside a transaction, and keeps nothing of it', async () => {
		const before = await db.Reading.count();
		await expect(
			db.getDb().transaction(async () => {
				const van = await db.Vehicle.findOne();
				await db.Reading.create({
					vehicleId: van!.id,
					takenAt: new Date(),
					deltaPMbar: 99,
					condition: 'idle',
					source: 'manual'
				});
				await db.Reading.create({
					vehicleId: 987654321,
					takenAt: new Date(),
					deltaPMbar: 120,
					condition: 'idle',
					source: 'manual'
				});
			})
		).rejects.toThrow(/foreign key/i);
		expect(await db.Reading.count()).toBe(before);
	});
});
