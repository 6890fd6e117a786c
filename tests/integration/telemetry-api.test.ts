import { createHash } from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { beforeAll, describe, expect, inject, it } from 'vitest';
import { z } from 'zod';
import { Client } from './http';
import { DEMO_ACCOUNTS } from '../../src/lib/server/demo/scenario';
import { readingsBatchSchema } from '../../src/lib/validation/telemetry';

const baseUrl = inject('baseUrl');
const fleet = new Client(baseUrl);
let db: typeof import('../../src/lib/server/db');
let vanId = 0;
let otherFleetVanId = 0;

/** Creates a token through Fleet settings, as a fleet manager would, and reads it off the page. */
async function newToken(name: string): Promise<string> {
	const res = await fleet.request('/fleet/settings?/create', {
		method: 'POST',
		headers: { 'content-type': 'application/x-www-form-urlencoded', accept: 'text/html' },
		body: new URLSearchParams({ name })
	});
	expect(res.status).toBe(200);
	const token = /sct_[A-Za-z0-9_-]{43}/.exec(await res.text())?.[0];
	expect(token, 'the new token is shown once on the page').toBeDefined();
	return token!;
}

function post(
	pathname: string,
	token: string | null,
	body: unknown,
	headers: Record<string, string> = {}
) {
	return fetch(baseUrl + pathname, {
		method: 'POST',
		headers: {
			'content-type': 'application/json',
			...(token ? { authorization: `Bearer ${token}` } : {}),
			...headers
		},
		body: typeof body === 'string' ? body : JSON.stringify(body)
	});
}

/** Whole seconds from one base time, so the same argument always gives the same instant. */
const BASE_MS = Math.floor(Date.now() / 1000) * 1000;
const at = (minutesAgo: number) => new Date(BASE_MS - minutesAgo * 60_000 - 23_000).toISOString();
const reading = (over: Record<string, unknown> = {}) => ({
	vehicleId: vanId,
	takenAt: at(90),
	deltaP: { format: 'mbar', value: 150 },
	...over
});

beforeAll(async () => {
	process.env.DATABASE_URL = inject('databaseUrl');
	db = await import('../../src/lib/server/db');
	db.getDb();
	vanId = (await db.Vehicle.findOne({ where: { registration: 'LKD 415' } }))!.id;
	otherFleetVanId = (await db.Vehicle.findOne({ where: { registration: 'TDU 72' } }))!.id;
	expect((await fleet.signIn(DEMO_ACCOUNTS.fleetManager.email)).status).toBe(303);
});

describe('API tokens', () => {
	it('are stored hashed, show their prefix and last use, and stop working once revoked', async () => {
		const token = await newToken('Gateway A');
		const row = await db.ApiToken.findOne({ where: { name: 'Gateway A' } });
		expect(row!.tokenHash).toBe(createHash('sha256').update(token).digest('hex'));
		expect(JSON.stringify(row!.get({ plain: true }))).not.toContain(token);
		expect(row!.lastUsedAt).toBeNull();

		const res = await post('/api/v1/readings', token, {
			readings: [reading({ takenAt: at(100) })]
		});
		expect(res.status).toBe(201);
		await row!.reload();
		expect(row!.lastUsedAt).not.toBeNull();
		const page = await (
			await fleet.request('/fleet/settings', { headers: { accept: 'text/html' } })
		).text();
		expect(page).toContain(token.slice(0, 12));
		expect(page).not.toContain(token);
		expect(page).toContain('last used');

		const revoke = await fleet.request('/fleet/settings?/revoke', {
			method: 'POST',
			headers: { 'content-type': 'application/x-www-form-urlencoded', accept: 'text/html' },
			body: new URLSearchParams({ tokenId: String(row!.id) })
		});
		expect(revoke.status).toBe(303);
		const after = await post('/api/v1/readings', token, {
			readings: [reading({ takenAt: at(101) })]
		});
		expect(after.status).toBe(401);
		expect(await after.json()).toMatchObject({
			error: { code: 'unauthorized', message: expect.stringContaining('revoked') }
		});
	});

	it('answer 401 without credentials or with an unknown token', async () => {
		const none = await post('/api/v1/readings', null, { readings: [reading()] });
		expect(none.status).toBe(401);
		expect(await none.json()).toMatchObject({ error: { code: 'unauthorized' } });
		expect(
			(await post('/api/v1/readings', 'sct_not-a-real-token', { readings: [reading()] })).status
		).toBe(401);
		const malformed = await fetch(baseUrl + '/api/v1/readings', {
			method: 'POST',
			headers: { authorization: 'Basic abc', 'content-type': 'application/json' },
			body: '{}'
		});
		expect(malformed.status).toBe(401);
	});

	it('are rate limited per token with 429 and Retry-After', async () => {
		const token = await newToken('Chatty unit');
		let limited: Response | null = null;
		for (let i = 0; i < 400 && !limited; i++) {
			const res = await fetch(baseUrl + '/api/v1/imports', {
				headers: { authorization: `Bearer ${token}` }
			});
			if (res.status === 429) limited = res;
			else expect(res.status).toBe(200);
		}
		expect(limited, 'a burst of requests runs into the limit').not.toBeNull();
		expect(Number(limited!.headers.get('retry-after'))).toBeGreaterThanOrEqual(1);
		expect(await limited!.json()).toMatchObject({ error: { code: 'rate_limited' } });
		// Requests arriving together are counted one by one: exactly the burst gets through.
		const racing = await newToken('Racing unit');
		const started = Date.now();
		const burst = await Promise.all(
			Array.from({ length: 80 }, () =>
				fetch(baseUrl + '/api/v1/imports', { headers: { authorization: `Bearer ${racing}` } })
			)
		);
		const refilled = Math.ceil(((Date.now() - started) / 1000) * (120 / 60));
		const passed = burst.filter((r) => r.status === 200).length;
		expect(burst.every((r) => r.status === 200 || r.status === 429)).toBe(true);
		// The burst allowance (API_RATE_BURST 60) plus what refilled (120 a minute) while they ran.
		expect(passed).toBeGreaterThanOrEqual(60);
		expect(passed).toBeLessThanOrEqual(60 + refilled);
		// Another token of the same fleet has its own allowance
		const fresh = await newToken('Quiet unit');
		expect(
			(await fetch(baseUrl + '/api/v1/imports', { headers: { authorization: `Bearer ${fresh}` } }))
				.status
		).toBe(200);
	});
});

describe('POST /api/v1/readings', () => {
	let token = '';
	beforeAll(async () => {
		token = await newToken('Telematics');
	});

	it('stores readings sent in mbar, J1939 SPN 3251 raw counts, PGN 64946 bytes and OBD PID 7A bytes', async () => {
		const times = [at(200), at(199), at(198), at(197)];
		const res = await post('/api/v1/readings', token, {
			readings: [
				{
					registration: 'lkd 415',
					takenAt: times[0],
					deltaP: { format: 'mbar', value: 142.5 },
					odometerKm: 88000
				},
				{ vehicleId: vanId, takenAt: times[1], deltaP: { format: 'j1939_spn3251', raw: 287 } },
				{
					vehicleId: vanId,
					takenAt: times[2],
					deltaP: { format: 'j1939_pgn64946', data: 'FF FF FF FF 2C 01 FF FF' }
				},
				{
					vehicleId: vanId,
					takenAt: times[3],
					deltaP: { format: 'obd_pid_7a', data: '41 7A 01 0B B8 00 00 00 00' }
				}
			]
		});
		expect(res.status).toBe(201);
		const body = (await res.json()) as { batchId: number; stored: number };
		expect(body.stored).toBe(4);
		const rows = await db.Reading.findAll({
			where: { importBatchId: body.batchId },
			order: [['takenAt', 'ASC']]
		});
		expect(rows.map((r) => r.source)).toEqual(['api', 'api', 'api', 'api']);
		expect(rows[0].deltaPMbar).toBeCloseTo(142.5, 9);
		// SPN 3251: 0.1 kPa/bit, offset 0 → 287 counts = 28.7 kPa = 287 mbar (standards.md §1)
		expect(rows[1].deltaPMbar).toBeCloseTo(287, 9);
		// PGN 64946 bytes 5–6 little-endian: 2C 01 = 0x012C = 300 counts = 300 mbar (standards.md §1)
		expect(rows[2].deltaPMbar).toBeCloseTo(300, 9);
		// PID 7A bytes B–C big-endian: 0B B8 = 3000 counts × 0.01 kPa (OBD_PID_7A_DELTA_KPA_PER_BIT) = 30 kPa = 300 mbar
		expect(rows[3].deltaPMbar).toBeCloseTo(300, 9);
	});

	it('replays an Idempotency-Key request without storing anything twice', async () => {
		const body = { readings: [reading({ takenAt: at(300) }), reading({ takenAt: at(299) })] };
		const before = await db.Reading.count({ where: { vehicleId: vanId } });
		const first = await post('/api/v1/readings', token, body, { 'idempotency-key': 'batch-7f3a' });
		expect(first.status).toBe(201);
		const firstBody = await first.json();
		const second = await post('/api/v1/readings', token, body, { 'idempotency-key': 'batch-7f3a' });
		expect(second.status).toBe(201);
		expect(second.headers.get('idempotent-replayed')).toBe('true');
		expect(await second.json()).toEqual(firstBody);
		expect(await db.Reading.count({ where: { vehicleId: vanId } })).toBe(before + 2);
		expect(await db.ImportBatch.count({ where: { id: firstBody.batchId } })).toBe(1);
		const reused = await post(
			'/api/v1/readings',
			token,
			{ readings: [reading({ takenAt: at(298) })] },
			{ 'idempotency-key': 'batch-7f3a' }
		);
		expect(reused.status).toBe(409);
		expect(await db.Reading.count({ where: { vehicleId: vanId } })).toBe(before + 2);
	});

	it('stores a batch once when the same Idempotency-Key arrives twice at the same moment', async () => {
		// Two instances (or two connections) answering a retried request in parallel.
		const body = { readings: [reading({ takenAt: at(320) }), reading({ takenAt: at(319) })] };
		const before = await db.Reading.count({ where: { vehicleId: vanId } });
		const answers = await Promise.all(
			[0, 1, 2].map(() =>
				post('/api/v1/readings', token, body, { 'idempotency-key': 'batch-race-1' })
			)
		);
		expect(answers.map((a) => a.status)).toEqual([201, 201, 201]);
		const bodies = await Promise.all(answers.map((a) => a.json()));
		expect(new Set(bodies.map((b) => b.batchId)).size).toBe(1);
		expect(answers.filter((a) => a.headers.get('idempotent-replayed') === 'true')).toHaveLength(2);
		expect(await db.Reading.count({ where: { vehicleId: vanId } })).toBe(before + 2);
	});

	it('stores the same readings once when two batches carrying them arrive at the same moment', async () => {
		const before = await db.Reading.count({ where: { vehicleId: vanId } });
		const body = { readings: [reading({ takenAt: at(330) }), reading({ takenAt: at(331) })] };
		const answers = await Promise.all([0, 1].map(() => post('/api/v1/readings', token, body)));
		expect(answers.map((a) => a.status).sort()).toEqual([200, 201]);
		expect(await db.Reading.count({ where: { vehicleId: vanId } })).toBe(before + 2);
	});

	it('stores a reading with a client reading id once, and reports the replay as a duplicate', async () => {
		const body = { readings: [reading({ takenAt: at(400), clientReadingId: 'unit9-000417' })] };
		const before = await db.Reading.count({ where: { vehicleId: vanId } });
		expect((await post('/api/v1/readings', token, body)).status).toBe(201);
		const replay = await post('/api/v1/readings', token, body);
		expect(replay.status).toBe(200);
		expect(await replay.json()).toEqual({
			batchId: null,
			stored: 0,
			duplicates: [
				{ index: 0, reason: 'clientReadingId “unit9-000417” is already stored for this van' }
			]
		});
		// Same van and time without an id is a duplicate too
		const sameTime = await post('/api/v1/readings', token, {
			readings: [reading({ takenAt: at(400) })]
		});
		expect(((await sameTime.json()) as { stored: number }).stored).toBe(0);
		expect(await db.Reading.count({ where: { vehicleId: vanId } })).toBe(before + 1);
	});

	it("answers 404 for another fleet's van and stores nothing of the batch", async () => {
		const before = await db.Reading.count({ where: { vehicleId: vanId } });
		const res = await post('/api/v1/readings', token, {
			readings: [
				reading({ takenAt: at(500) }),
				reading({ vehicleId: otherFleetVanId, takenAt: at(501) })
			]
		});
		expect(res.status).toBe(404);
		expect(await res.json()).toMatchObject({
			error: { code: 'not_found', message: expect.stringContaining('readings[1]') }
		});
		const byRegistration = await post('/api/v1/readings', token, {
			readings: [
				{ registration: 'TDU 72', takenAt: at(502), deltaP: { format: 'mbar', value: 90 } }
			]
		});
		expect(byRegistration.status).toBe(404);
		expect(await db.Reading.count({ where: { vehicleId: vanId } })).toBe(before);
	});

	it('answers 400 for malformed JSON', async () => {
		const res = await post('/api/v1/readings', token, '{"readings": [');
		expect(res.status).toBe(400);
		expect(await res.json()).toMatchObject({ error: { code: 'invalid_json' } });
	});

	it('answers 400 with the zod issues for a schema mismatch', async () => {
		const res = await post('/api/v1/readings', token, {
			readings: [{ vehicleId: vanId, takenAt: 'last tuesday', deltaP: { format: 'bar', value: 1 } }]
		});
		expect(res.status).toBe(400);
		const body = (await res.json()) as {
			error: {
				code: string;
				issues: { path: (string | number)[]; message: string }[];
				fields: Record<string, string>;
			};
		};
		expect(body.error.code).toBe('invalid');
		const paths = body.error.issues.map((i) => i.path.join('.'));
		expect(paths).toContain('readings.0.takenAt');
		expect(paths).toContain('readings.0.deltaP.format');
		expect(body.error.fields['readings.0.takenAt']).toMatch(/ISO 8601/);
	});

	it('answers 400 for a J1939 "not available" value and for a reading in the future', async () => {
		const na = await post('/api/v1/readings', token, {
			readings: [reading({ takenAt: at(600), deltaP: { format: 'j1939_spn3251', raw: 65535 } })]
		});
		expect(na.status).toBe(400);
		expect(((await na.json()) as any).error.fields['readings.0.deltaP']).toMatch(
			/0xFFFF is above 0xFAFF/
		);
		const future = await post('/api/v1/readings', token, {
			readings: [reading({ takenAt: new Date(Date.now() + 86_400_000).toISOString() })]
		});
		expect(future.status).toBe(400);
		expect(((await future.json()) as any).error.message).toMatch(/in the future/);
	});

	it('answers 413 for a body over the limit', async () => {
		const many = Array.from({ length: 1000 }, (_, i) =>
			reading({
				takenAt: at(1000 + i),
				clientReadingId: 'x'.repeat(80) + String(i).padStart(4, '0')
			})
		);
		const padded = JSON.stringify({ readings: many }) + ' '.repeat(1024 * 1024);
		const res = await post('/api/v1/readings', token, padded);
		expect(res.status).toBe(413);
		expect(await res.json()).toMatchObject({ error: { code: 'too_large' } });
	});

	it('lets a signed-in fleet manager use the same endpoint', async () => {
		const res = await fleet.request('/api/v1/readings', {
			method: 'POST',
			headers: { 'content-type': 'application/json' },
			body: JSON.stringify({ readings: [reading({ takenAt: at(700) })] })
		});
		expect(res.status).toBe(201);
	});
});

describe('POST /api/v1/events', () => {
	it('stores filter events and reports repeats as duplicates', async () => {
		const token = await newToken('Events unit');
		const body = {
			events: [
				{ vehicleId: vanId, occurredAt: at(800), kind: 'regen_active', clientEventId: 'ev-1' },
				{ vehicleId: vanId, occurredAt: at(700), kind: 'regen_interrupted' }
			]
		};
		const first = await post('/api/v1/events', token, body);
		expect(first.status).toBe(201);
		const { batchId } = (await first.json()) as { batchId: number };
		expect(await db.VehicleEvent.count({ where: { importBatchId: batchId } })).toBe(2);
		const again = await post('/api/v1/events', token, body);
		expect(again.status).toBe(200);
		expect(((await again.json()) as { duplicates: unknown[] }).duplicates).toHaveLength(2);
	});
});

describe('GET /api/v1/openapi.json', () => {
	it('is an OpenAPI 3.1 document whose request schemas are the zod schemas the routes use', async () => {
		const res = await fetch(baseUrl + '/api/v1/openapi.json');
		expect(res.status).toBe(200);
		const doc = (await res.json()) as {
			openapi: string;
			paths: Record<string, unknown>;
			components: { schemas: Record<string, unknown> };
		};
		expect(doc.openapi).toBe('3.1.0');
		const { $schema: _s, ...expected } = z.toJSONSchema(readingsBatchSchema, {
			io: 'input',
			unrepresentable: 'any'
		}) as Record<string, unknown>;
		expect(doc.components.schemas.ReadingsBatch).toEqual(expected);
	});

	it('documents only routes that exist, and every route of the telemetry, import and capture API', async () => {
		const doc = (await (await fetch(baseUrl + '/api/v1/openapi.json')).json()) as {
			paths: Record<string, Record<string, unknown>>;
		};
		const root = path.resolve('src/routes');
		const routeFile = (p: string) =>
			path.join(root, p.replace(/\{(\w+)\}/g, '[$1=id]'), '+server.ts');
		for (const [p, methods] of Object.entries(doc.paths)) {
			const file = routeFile(p);
			expect(fs.existsSync(file), `${p} is documented but has no route file`).toBe(true);
			const source = fs.readFileSync(file, 'utf8');
			for (const method of Object.keys(methods))
				expect(source, `${p} ${method}`).toMatch(
					new RegExp(`export const ${method.toUpperCase()}\\b`)
				);
		}
		for (const p of [
			'readings',
			'events',
			'imports',
			'imports/{uploadId}',
			'import-batches/{batchId}',
			'vehicles/{vehicleId}/captures',
			'sensor-tests/{testId}/trace',
			'uploads/{uploadId}',
			'visit-reports/{reportId}/attachments/{attachmentId}'
		]) {
			expect(doc.paths[`/api/v1/${p}`], p).toBeDefined();
		}
	});
});
