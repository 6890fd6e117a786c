/**
 * bench:dashboard — seeds 5,000 vans with current statuses, starts the built server, signs in
 * as the fleet manager and drives the risk-board API with autocannon; the floor is the trivial
 * health endpoint measured the same way in the same run. Prints p50/p95 of both and the p95
 * ratio (aim ≤ 5), and checks the first page of the board renders server-side. Build first.
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import net from 'node:net';
import { spawn } from 'node:child_process';
import sqlite3 from 'sqlite3';
import autocannon from 'autocannon';

const VANS = Number(process.env.BENCH_VANS ?? 5_000);
const SECONDS = Number(process.env.BENCH_SECONDS ?? 8);
const CONNECTIONS = 10;
const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'sootcast-bench-dashboard-'));
const file = path.join(dir, 'bench.sqlite');
process.env.DATABASE_URL = `sqlite:${file}`;

const db = await import('../src/lib/server/db');
const { hashPassword } = await import('../src/lib/server/auth/password');
const { urgencyKey } = await import('../src/lib/server/services/forecasts');
const { createRandom } = await import('../src/lib/domain/stats/random');
const { VAN_STATUSES } = await import('../src/lib/domain/status');

if (!fs.existsSync('build/index.js')) throw new Error('Run `npm run build` first.');
await db.migrate();
await db.closeDb();

const run = (d: sqlite3.Database, sql: string, params: unknown[] = []) =>
	new Promise<void>((resolve, reject) =>
		d.run(sql, params, (err) => (err ? reject(err) : resolve()))
	);
console.log(`Seeding ${VANS} vans…`);
{
	const d = new sqlite3.Database(file);
	const now = new Date();
	// Sequelize's own SQLite date format, so the app reads these rows like its own.
	const sqlDate = (d: Date) => d.toISOString().replace('T', ' ').replace('Z', ' +00:00');
	const stamp = sqlDate(now);
	await run(d, 'BEGIN');
	await run(
		d,
		`INSERT INTO organisations (id, name, kind, time_zone, created_at, updated_at) VALUES (1, 'Bench fleet', 'fleet', 'Europe/London', ?, ?)`,
		[stamp, stamp]
	);
	await run(
		d,
		`INSERT INTO users (organisation_id, email, name, role, notify_statuses, password_hash, created_at, updated_at) VALUES (1, 'bench@fleet.test', 'Bench', 'fleet_manager', '[]', ?, ?, ?)`,
		[await hashPassword('bench-password'), stamp, stamp]
	);
	for (let i = 1; i <= 3; i++)
		await run(
			d,
			`INSERT INTO depots (id, organisation_id, name, created_at, updated_at) VALUES (?, 1, ?, ?, ?)`,
			[i, `Depot ${i}`, stamp, stamp]
		);
	const random = createRandom(11);
	const van = d.prepare(
		`INSERT INTO vehicles (id, organisation_id, depot_id, registration, fuel, created_at, updated_at) VALUES (?, 1, ?, ?, 'en590_diesel', ?, ?)`
	);
	const status = d.prepare(
		`INSERT INTO vehicle_statuses (vehicle_id, status, urgency, no_crossing, confidence, latest_mbar, concern_line_mbar, growth_mbar_per_week, crossing_expected, computed_at) VALUES (?, ?, ?, ?, 'fair', ?, 300, ?, ?, ?)`
	);
	for (let v = 1; v <= VANS; v++) {
		van.run(v, 1 + (v % 3), `BEN ${String(v).padStart(5, '0')}`, stamp, stamp);
		const s = VAN_STATUSES[Math.floor(random.uniform() * VAN_STATUSES.length)];
		const expected =
			s === 'healthy' || s === 'insufficient_data'
				? null
				: new Date(now.getTime() + random.uniform() * 120 * 86_400_000);
		status.run(
			v,
			s,
			urgencyKey(s, expected, now),
			expected ? 0 : 1,
			100 + random.uniform() * 250,
			random.uniform() * 20,
			expected ? sqlDate(expected) : null,
			stamp
		);
	}
	await new Promise<void>((r) => van.finalize(() => r()));
	await new Promise<void>((r) => status.finalize(() => r()));
	await run(d, 'COMMIT');
	await new Promise<void>((r) => d.close(() => r()));
}

const port = await new Promise<number>((resolve) => {
	const s = net.createServer().listen(0, '127.0.0.1', () => {
		const p = (s.address() as net.AddressInfo).port;
		s.close(() => resolve(p));
	});
});
const base = `http://127.0.0.1:${port}`;
const server = spawn(process.execPath, ['build/index.js'], {
	env: {
		...process.env,
		PORT: String(port),
		HOST: '127.0.0.1',
		ORIGIN: base,
		DATABASE_URL: `sqlite:${file}`,
		NODE_ENV: 'production'
	},
	stdio: ['ignore', 'ignore', 'inherit']
});
try {
	for (let i = 0; ; i++) {
		try {
			if ((await fetch(`${base}/api/health`)).ok) break;
		} catch {
			if (i > 200) throw new Error('server did not start');
		}
		await new Promise((r) => setTimeout(r, 100));
	}
	const login = await fetch(`${base}/login`, {
		method: 'POST',
		redirect: 'manual',
		headers: {
			origin: base,
			'content-type': 'application/x-www-form-urlencoded',
			accept: 'text/html'
		},
		body: new URLSearchParams({ email: 'bench@fleet.test', password: 'bench-password' })
	});
	const cookie = (login.headers.get('set-cookie') ?? '').split(';')[0];
	if (!cookie) throw new Error(`sign-in failed (${login.status})`);

	// The server-rendered first page carries one page of vans, not all of them.
	const html = await (await fetch(`${base}/fleet`, { headers: { cookie } })).text();
	const rowsRendered = (html.match(/href="\/fleet\/vans\/\d+"/g) ?? []).length;
	console.log(`First page rendered server-side with ${rowsRendered} van links (of ${VANS}).`);

	async function measure(label: string, url: string) {
		const times: number[] = [];
		let errors = 0;
		const instance = autocannon({
			url,
			connections: CONNECTIONS,
			duration: SECONDS,
			headers: { cookie }
		});
		instance.on('response', (_client: unknown, status: number, _bytes: number, ms: number) => {
			if (status !== 200) errors++;
			times.push(ms);
		});
		await instance;
		times.sort((a, b) => a - b);
		const at = (q: number) => times[Math.min(times.length - 1, Math.floor(q * times.length))];
		const r = { label, requests: times.length, errors, p50: at(0.5), p95: at(0.95) };
		console.log(
			`${label}: ${r.requests} requests, p50 ${r.p50.toFixed(1)} ms, p95 ${r.p95.toFixed(1)} ms, non-200: ${errors}`
		);
		return r;
	}
	const health = await measure('health (floor)', `${base}/api/health`);
	const board = await measure(
		'risk board API',
		`${base}/api/v1/board?sort=urgency&page=3&pageSize=25`
	);
	const filtered = await measure(
		'risk board API, filtered',
		`${base}/api/v1/board?status=crossing_soon&depot=2&sort=crossing&dir=desc`
	);
	if (board.errors || filtered.errors) throw new Error('the board answered errors under load');
	const ratio = board.p95 / health.p95;
	console.log(`p95 ratio board/health: ${ratio.toFixed(2)} (aim ≤ 5)`);
	console.log(
		JSON.stringify({
			bench: 'dashboard',
			vans: VANS,
			connections: CONNECTIONS,
			seconds: SECONDS,
			health_p50_ms: +health.p50.toFixed(2),
			health_p95_ms: +health.p95.toFixed(2),
			board_p50_ms: +board.p50.toFixed(2),
			board_p95_ms: +board.p95.toFixed(2),
			filtered_p95_ms: +filtered.p95.toFixed(2),
			ratio: +ratio.toFixed(2),
			first_page_rows: rowsRendered
		})
	);
} finally {
	server.kill('SIGTERM');
	fs.rmSync(dir, { recursive: true, force: true });
}
