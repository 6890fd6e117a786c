/**
 * Import throughput benchmark: `npm run bench:import`.
 * Writes a 100,000-row readings CSV (10 vans), imports it through the same service code as the
 * pages and the API (stage → check every row → one transaction), then inserts the same rows
 * with raw sqlite3 prepared statements in one transaction into an identical empty database.
 * Prints rows/s for both and their ratio (aim ≤ 3), ending with one JSON line.
 */
import { mkdtemp, rm, writeFile } from 'node:fs/promises';
import { createReadStream } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

const ROWS = 100_000;
const VANS = 10;

const dir = await mkdtemp(join(tmpdir(), 'sootcast-bench-import-'));
process.env.DATABASE_URL = `sqlite:${join(dir, 'service.db')}`;
process.env.STORAGE_DIR = join(dir, 'uploads');
process.env.IMPORT_MAX_ROWS = String(ROWS);

const seconds = (from: bigint) => Number(process.hrtime.bigint() - from) / 1e9;

async function main() {
	const db = await import('../src/lib/server/db');
	const { stageImportFile, runImport } = await import('../src/lib/server/services/imports');
	await db.migrate();
	const now = new Date();
	const org = await db.Organisation.create({ name: 'Bench fleet', kind: 'fleet' });
	const user = await db.User.create({
		organisationId: org.id,
		email: 'bench@sootcast.test',
		name: 'Bench',
		role: 'fleet_manager',
		notifyStatuses: []
	} as never);
	const vans = [];
	for (let i = 0; i < VANS; i++)
		vans.push(await db.Vehicle.create({ organisationId: org.id, registration: `BEN ${100 + i}` }));

	// 10,000 readings per van, one every 40 minutes back from now
	const lines = ['registration,taken_at,dp_mbar,odometer_km,condition'];
	const rows: { vehicleId: number; takenAt: Date; mbar: number; km: number }[] = [];
	for (let v = 0; v < VANS; v++) {
		for (let k = 0; k < ROWS / VANS; k++) {
			const takenAt = new Date(now.getTime() - (k + 1) * 40 * 60_000 - v * 1000);
			const mbar = 60 + ((k * 7 + v * 13) % 180) + 0.5;
			const km = 250_000 - k * 3;
			lines.push(`${vans[v].registration},${takenAt.toISOString()},${mbar},${km},road load`);
			rows.push({ vehicleId: vans[v].id, takenAt, mbar, km });
		}
	}
	const csvPath = join(dir, 'readings.csv');
	await writeFile(csvPath, lines.join('\n') + '\n');
	const sessionUser = {
		id: user.id,
		email: user.email,
		name: user.name,
		role: 'fleet_manager' as const,
		organisationId: org.id,
		unitPreference: 'mbar' as const,
		locale: 'en-GB',
		timeZone: 'Europe/London'
	};

	let start = process.hrtime.bigint();
	const staged = await stageImportFile(sessionUser, {
		fileName: 'readings.csv',
		body: createReadStream(csvPath)
	});
	const result = await runImport(sessionUser, staged.uploadId, {
		kind: 'readings',
		unit: 'mbar',
		dateFormat: 'iso',
		condition: 'idle'
	});
	const serviceS = seconds(start);
	if (result.stored !== ROWS) throw new Error(`stored ${result.stored} of ${ROWS} rows`);
	const stored = await db.Reading.count({ where: { importBatchId: result.batchId } });
	if (stored !== ROWS) throw new Error(`found ${stored} rows in the database, expected ${ROWS}`);
	await db.closeDb();
	console.log(
		`service: ${ROWS.toLocaleString('en')} rows in ${serviceS.toFixed(2)} s = ${Math.round(ROWS / serviceS).toLocaleString('en')} rows/s`
	);

	// Floor: the same rows, raw sqlite3, one transaction, same schema and pragmas
	process.env.DATABASE_URL = `sqlite:${join(dir, 'raw.db')}`;
	const { createSequelize } = await import('../src/lib/server/db/sequelize');
	const { createMigrator } = await import('../src/lib/server/db/migrator');
	const seq = createSequelize(process.env.DATABASE_URL);
	await createMigrator(seq).up();
	await seq.query(
		"INSERT INTO organisations (id, name, kind, time_zone, created_at, updated_at) VALUES (1, 'Raw', 'fleet', 'Europe/London', '2025-01-01', '2025-01-01')"
	);
	for (const v of vans) {
		await seq.query(
			`INSERT INTO vehicles (id, organisation_id, registration, fuel, created_at, updated_at) VALUES (${v.id}, 1, '${v.registration}', 'en590_diesel', '2025-01-01', '2025-01-01')`
		);
	}
	await seq.close();
	const sqlite3 = (await import('sqlite3')).default;
	const raw = new sqlite3.Database(join(dir, 'raw.db'));
	const run = (sql: string) =>
		new Promise<void>((res, rej) => raw.run(sql, (err) => (err ? rej(err) : res())));
	await run('PRAGMA journal_mode=WAL');
	await run('PRAGMA synchronous=NORMAL');
	await run('PRAGMA foreign_keys=ON');
	const stamp = now.toISOString().replace('T', ' ').replace('Z', ' +00:00');
	start = process.hrtime.bigint();
	await run('BEGIN IMMEDIATE');
	const stmt = raw.prepare(
		'INSERT INTO readings (vehicle_id, taken_at, odometer_km, delta_p_mbar, condition, source, created_at, updated_at) VALUES (?, ?, ?, ?, ?, ?, ?, ?)'
	);
	await new Promise<void>((resolve, reject) => {
		let pending = rows.length;
		for (const r of rows) {
			stmt.run(
				r.vehicleId,
				r.takenAt.toISOString().replace('T', ' ').replace('Z', ' +00:00'),
				r.km,
				r.mbar,
				'road_load',
				'import',
				stamp,
				stamp,
				(err: Error | null) => {
					if (err) reject(err);
					else if (--pending === 0) resolve();
				}
			);
		}
	});
	await new Promise<void>((res) => stmt.finalize(() => res()));
	await run('COMMIT');
	const rawS = seconds(start);
	raw.close();
	console.log(
		`raw sqlite3: ${ROWS.toLocaleString('en')} rows in ${rawS.toFixed(2)} s = ${Math.round(ROWS / rawS).toLocaleString('en')} rows/s`
	);
	const ratio = serviceS / rawS;
	console.log(
		`ratio service/raw: ${ratio.toFixed(2)} (aim ≤ 3); peak RSS ${(process.resourceUsage().maxRSS / 1024).toFixed(0)} MB`
	);
	console.log(
		JSON.stringify({
			bench: 'import',
			rows: ROWS,
			rows_per_s: Math.round(ROWS / serviceS),
			raw_rows_per_s: Math.round(ROWS / rawS),
			ratio: Number(ratio.toFixed(2))
		})
	);
}

try {
	await main();
} finally {
	await rm(dir, { recursive: true, force: true });
}
