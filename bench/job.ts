/**
 * bench:job — the nightly forecast over 5,000 vans × 2 years of weekly readings, through the
 * same service code as the job, against the floor of reading all those rows with one raw
 * sqlite3 SELECT. Prints vans/s and the ratio (aim ≤ 4), then one JSON line.
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import sqlite3 from 'sqlite3';

const VANS = Number(process.env.BENCH_VANS ?? 5_000);
const WEEKS = 104;
const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'sootcast-bench-job-'));
const file = path.join(dir, 'bench.sqlite');
process.env.DATABASE_URL = `sqlite:${file}`;
process.env.PUBLIC_URL = 'http://sootcast.test';

const db = await import('../src/lib/server/db');
const { runNightlyForecast } = await import('../src/lib/server/services/nightly-forecast');
const { createRandom } = await import('../src/lib/domain/stats/random');

function raw(): sqlite3.Database {
	return new sqlite3.Database(file);
}
const run = (d: sqlite3.Database, sql: string, params: unknown[] = []) =>
	new Promise<void>((resolve, reject) =>
		d.run(sql, params, (err) => (err ? reject(err) : resolve()))
	);
const all = (d: sqlite3.Database, sql: string) =>
	new Promise<unknown[]>((resolve, reject) =>
		d.all(sql, (err, rows) => (err ? reject(err) : resolve(rows)))
	);

await db.migrate();
const now = new Date(Date.UTC(2026, 11, 1, 2));
console.log(`Building ${VANS} vans × ${WEEKS} weekly readings…`);
{
	const d = raw();
	const stamp = now.toISOString();
	await run(d, 'BEGIN');
	await run(
		d,
		`INSERT INTO organisations (id, name, kind, time_zone, created_at, updated_at) VALUES (1, 'Bench fleet', 'fleet', 'Europe/London', ?, ?)`,
		[stamp, stamp]
	);
	await run(
		d,
		`INSERT INTO users (organisation_id, email, name, role, notify_statuses, created_at, updated_at, password_hash) VALUES (1, 'bench@fleet.test', 'Bench', 'fleet_manager', '["over_line","crossing_soon"]', ?, ?, 'x')`,
		[stamp, stamp]
	);
	const random = createRandom(7);
	const insertVan = d.prepare(
		`INSERT INTO vehicles (id, organisation_id, registration, fuel, created_at, updated_at) VALUES (?, 1, ?, 'en590_diesel', ?, ?)`
	);
	const insertReading = d.prepare(
		`INSERT INTO readings (vehicle_id, taken_at, odometer_km, delta_p_mbar, condition, source, created_at, updated_at) VALUES (?, ?, ?, ?, 'road_load', 'demo', ?, ?)`
	);
	for (let v = 1; v <= VANS; v++) {
		insertVan.run(v, `BEN ${v}`, stamp, stamp);
		const growth = 2 + random.uniform() * 6; // mbar per week between regenerations
		let level = 90 + random.uniform() * 60;
		for (let w = 0; w < WEEKS; w++) {
			level += growth;
			if (level > 230) level = 95 + w * 0.1; // a regeneration, with a little ash
			const at = new Date(now.getTime() - (WEEKS - w) * 7 * 86_400_000).toISOString();
			insertReading.run(v, at, 40_000 + w * 700, level + random.normal() * 4, stamp, stamp);
		}
	}
	await new Promise<void>((r) => insertVan.finalize(() => r()));
	await new Promise<void>((r) => insertReading.finalize(() => r()));
	await run(d, 'COMMIT');
	await new Promise<void>((r) => d.close(() => r()));
}

// Floor: every row the run needs, read once with the bare driver.
const floorStart = performance.now();
{
	const d = raw();
	const rows = await all(
		d,
		'SELECT vehicle_id, taken_at, odometer_km, delta_p_mbar, condition FROM readings ORDER BY vehicle_id, taken_at'
	);
	if (rows.length !== VANS * WEEKS)
		throw new Error(`expected ${VANS * WEEKS} rows, read ${rows.length}`);
	await new Promise<void>((r) => d.close(() => r()));
}
const floorSeconds = (performance.now() - floorStart) / 1000;

const started = performance.now();
const summary = await runNightlyForecast(now, null);
const seconds = (performance.now() - started) / 1000;
if (summary.forecast !== VANS) throw new Error(`forecast ${summary.forecast} of ${VANS} vans`);

const vansPerS = VANS / seconds;
const ratio = seconds / floorSeconds;
console.log(
	`Full run: ${seconds.toFixed(2)} s for ${VANS} vans (${vansPerS.toFixed(0)} vans/s); statuses changed: ${summary.statusChanges}`
);
console.log(`Floor (one raw SELECT of ${VANS * WEEKS} rows): ${floorSeconds.toFixed(2)} s`);
console.log(`Ratio run/floor: ${ratio.toFixed(2)} (aim ≤ 4)`);
await db.closeDb();
fs.rmSync(dir, { recursive: true, force: true });
console.log(
	JSON.stringify({
		bench: 'job',
		vans: VANS,
		readings: VANS * WEEKS,
		seconds: +seconds.toFixed(3),
		vans_per_s: +vansPerS.toFixed(1),
		floor_seconds: +floorSeconds.toFixed(3),
		ratio: +ratio.toFixed(2)
	})
);
