import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Client } from './http';
import { startBuiltServer, type RunningServer } from './servers';
import { createTestDatabase } from './test-database';
import { DEMO_ACCOUNTS } from '../../src/lib/server/demo/scenario';

// Two app instances behind an imagined load balancer: one database, one storage folder, one
// APP_SECRET. Whatever one instance learns (a session, a failed sign-in, a spent request, an
// idempotency key) the other must know, because it lives in the database, not in a process.
const database = await createTestDatabase('two_instances');
process.env.DATABASE_URL = database.url;
const db = await import('../../src/lib/server/db');
const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'sootcast-two-'));
let a: RunningServer;
let b: RunningServer;

beforeAll(async () => {
	const { seedDemo } = await import('../../src/lib/server/services/demo-seed');
	await db.migrate();
	await seedDemo(new Date(), 20);
	const env = { DATABASE_URL: database.url, STORAGE_DIR: path.join(dir, 'uploads') };
	[a, b] = await Promise.all([startBuiltServer(env), startBuiltServer(env)]);
});

afterAll(async () => {
	await Promise.all([a?.stop(), b?.stop()]);
	await db.closeDb();
	await database.drop();
	fs.rmSync(dir, { recursive: true, force: true });
});

const page = (client: Client, pathname: string) =>
	client.request(pathname, { headers: { accept: 'text/html' } });

describe(`two instances on one ${database.kind} database`, () => {
	it('share sessions: signed in on one, known on the other; signed out on one, gone on both', async () => {
		const onA = new Client(a.baseUrl);
		expect((await onA.signIn(DEMO_ACCOUNTS.fleetManager.email)).status).toBe(303);
		const onB = new Client(b.baseUrl).useSessionOf(onA);
		expect((await page(onB, '/fleet')).status).toBe(200);

		const out = await onB.request('/logout', {
			method: 'POST',
			headers: { 'content-type': 'application/x-www-form-urlencoded', accept: 'text/html' },
			body: ''
		});
		expect(out.status).toBe(303);
		const after = await page(new Client(a.baseUrl).useSessionOf(onA), '/fleet');
		expect(after.status).toBe(303);
		expect(after.headers.get('location')).toMatch(/^\/login/);
	});

	it('count failed sign-ins together: five wrong passwords spread over both lock the sixth on either', async () => {
		const email = DEMO_ACCOUNTS.driver.email;
		for (let i = 1; i <= 5; i++) {
			const res = await new Client(i % 2 ? a.baseUrl : b.baseUrl).signIn(email, `wrong-${i}`);
			expect(res.status, `attempt ${i}`).toBe(400);
		}
		for (const server of [a, b]) {
			const locked = await new Client(server.baseUrl).signIn(email);
			expect(locked.status).toBe(429);
		}
	});

	it('spend one API allowance per token and replay an Idempotency-Key across instances', async () => {
		const manager = new Client(a.baseUrl);
		expect((await manager.signIn(DEMO_ACCOUNTS.fleetManager.email)).status).toBe(303);
		const created = await manager.request('/fleet/settings?/create', {
			method: 'POST',
			headers: { 'content-type': 'application/x-www-form-urlencoded', accept: 'text/html' },
			body: new URLSearchParams({ name: 'Depot gateway' })
		});
		const token = /sct_[A-Za-z0-9_-]{43}/.exec(await created.text())![0];
		const auth = { authorization: `Bearer ${token}` };

		const van = await db.Vehicle.findOne({ where: { registration: 'LKD 415' } });
		const body = JSON.stringify({
			readings: [
				{
					vehicleId: van!.id,
					takenAt: new Date(Date.now() - 3_600_000).toISOString(),
					deltaP: { format: 'mbar', value: 142 }
				}
			]
		});
		const send = (server: RunningServer) =>
			fetch(`${server.baseUrl}/api/v1/readings`, {
				method: 'POST',
				headers: { ...auth, 'content-type': 'application/json', 'idempotency-key': 'gw-0001' },
				body
			});
		const first = await send(a);
		const again = await send(b);
		expect(first.status).toBe(201);
		expect(again.status).toBe(201);
		expect(again.headers.get('idempotent-replayed')).toBe('true');
		expect(await again.json()).toEqual(await first.json());

		// 80 requests at once, half to each instance: the one bucket lets the burst (60) through,
		// plus what refilled at 120 a minute while they were answered.
		const started = Date.now();
		const burst = await Promise.all(
			Array.from({ length: 80 }, (_, i) =>
				fetch(`${(i % 2 ? a : b).baseUrl}/api/v1/imports`, { headers: auth })
			)
		);
		const refilled = Math.ceil(((Date.now() - started) / 1000) * 2);
		const passed = burst.filter((r) => r.status === 200).length;
		expect(burst.every((r) => r.status === 200 || r.status === 429)).toBe(true);
		// The two readings requests above spent two of the 60.
		expect(passed).toBeGreaterThanOrEqual(58);
		expect(passed).toBeLessThanOrEqual(58 + refilled);
	});
});
