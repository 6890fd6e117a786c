import fs from 'node:fs';
import net from 'node:net';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { factories } from './factories';
import { createTestDatabase } from './test-database';
import { readMailbox, recipients } from './mail';

// Its own database and mail sink: the test counts every message, so nothing else may write.
const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'sootcast-forecast-job-'));
const database = await createTestDatabase('forecast_job');
process.env.DATABASE_URL = database.url;
process.env.PUBLIC_URL = 'http://sootcast.test';

const db = await import('../../src/lib/server/db');
const { configureMailTransport } = await import('../../src/lib/server/mail/mailer');
const { startMailSink } = await import('../../src/lib/server/mail/sink');
const { runUnderLease } = await import('../../src/lib/server/services/job-runner');
const { runNightlyForecast } = await import('../../src/lib/server/services/nightly-forecast');
const { deliverDueMail, retryDelayMs } = await import('../../src/lib/server/services/outbox');

const now = new Date(Date.UTC(2026, 10, 20, 2, 0));
const mailDir = path.join(dir, 'mail');
const ids: Record<string, number> = {};
const make = factories(db);

function freePort(): Promise<number> {
	return new Promise((resolve) => {
		const s = net.createServer().listen(0, '127.0.0.1', () => {
			const { port } = s.address() as net.AddressInfo;
			s.close(() => resolve(port));
		});
	});
}

const runJob = (at: Date) =>
	runUnderLease('forecast', ({ now: n, runId }) => runNightlyForecast(n, runId), { now: at });

async function digestsTo(email: string) {
	return (await readMailbox(mailDir)).filter((m) => recipients(m).includes(email));
}
const vansNamed = (text: string) => [...text.matchAll(/^(GFC \d+) —/gm)].map((m) => m[1]).sort();

afterAll(async () => {
	await db.closeDb();
	await database.drop();
});

beforeAll(async () => {
	await db.migrate();
	const fleet = await make.organisation('Gorsefield Couriers', 'fleet');
	const garage = await make.organisation('Hollin Garage', 'workshop');
	const former = await make.organisation('Old Quarry Motors', 'workshop');
	await make.contract(fleet.id, garage.id, '2025-01-01');
	await make.contract(fleet.id, former.id, '2024-01-01', '2025-06-30');
	await make.person(fleet.id, 'manager@gorsefield.test', 'fleet_manager');
	await make.person(fleet.id, 'quiet.manager@gorsefield.test', 'fleet_manager', {
		notifyDigest: false
	});
	await make.person(fleet.id, 'driver@gorsefield.test', 'driver');
	await make.person(garage.id, 'tech@hollin.test', 'workshop');
	await make.person(former.id, 'tech@oldquarry.test', 'workshop');

	// Past the line for weeks; rising steadily towards it without regenerating; comfortably low.
	const over = await make.van(fleet.id, 'GFC 1');
	await make.readings(
		over.id,
		new Date(now.getTime() - 86_400_000),
		12,
		3,
		(i) => 330 + (i % 3) * 4
	);
	const rising = await make.van(fleet.id, 'GFC 2');
	await make.readings(
		rising.id,
		new Date(now.getTime() - 86_400_000),
		12,
		3,
		(i) => 170 + i * 9 + (i % 2) * 2
	);
	const fine = await make.van(fleet.id, 'GFC 3');
	await make.readings(
		fine.id,
		new Date(now.getTime() - 86_400_000),
		12,
		3,
		(i) => 120 + (i % 3) * 3
	);
	const broken = await make.van(fleet.id, 'GFC 4');
	await make.readings(broken.id, new Date(now.getTime() - 86_400_000), 8, 3, (i) => 150 + i);
	// A row written around the app. SQLite stores any text in a time column; PostgreSQL's typed
	// columns refuse that, but a float column takes NaN, which is just as unusable.
	const breakage =
		database.kind === 'sqlite' ? `taken_at = 'not a date'` : `delta_p_mbar = 'NaN'::float8`;
	await db
		.getDb()
		.query(
			`UPDATE readings SET ${breakage} WHERE vehicle_id = ${broken.id} AND id = (SELECT MIN(id) FROM readings WHERE vehicle_id = ${broken.id})`
		);
	Object.assign(ids, { over: over.id, rising: rising.id, fine: fine.id, broken: broken.id });
});

describe('the nightly forecast job', () => {
	it('sends each expected recipient exactly one digest naming exactly the expected vans, and reports the broken van', async () => {
		const sink = await startMailSink({ port: 0, dir: mailDir });
		configureMailTransport(`smtp://127.0.0.1:${sink.port}`);
		try {
			const outcome = await runJob(now);
			expect(outcome.skipped).toBe(false);
			const summary = (outcome as { summary: Record<string, number | string> }).summary;
			expect(summary).toMatchObject({ vans: 4, forecast: 3, failed: 1, failedVans: 'GFC 4' });

			const statuses = Object.fromEntries(
				(await db.Forecast.findAll({ raw: true })).map((f) => [f.vehicleId, f.status])
			);
			expect(statuses[ids.over]).toBe('over_line');
			expect(statuses[ids.rising]).toBe('crossing_soon');
			expect(['healthy', 'watch']).toContain(statuses[ids.fine]);

			for (const email of ['manager@gorsefield.test', 'tech@hollin.test']) {
				const mails = await digestsTo(email);
				expect(mails, email).toHaveLength(1);
				expect(vansNamed(mails[0].text ?? '')).toEqual(['GFC 1', 'GFC 2']);
				const area = email.includes('hollin') ? 'workshop' : 'fleet';
				expect(mails[0].text).toContain(`http://sootcast.test/${area}/vans/${ids.rising}`);
				expect(mails[0].html).toContain('GFC 2');
			}
			for (const email of [
				'quiet.manager@gorsefield.test',
				'driver@gorsefield.test',
				'tech@oldquarry.test'
			]) {
				expect(await digestsTo(email), email).toHaveLength(0);
			}
			const total = (await readMailbox(mailDir)).length;

			// The same night again: nothing changed, nothing new is sent.
			const again = await runJob(new Date(now.getTime() + 60_000));
			expect((again as { summary: Record<string, number> }).summary.messagesQueued).toBe(0);
			expect((await readMailbox(mailDir)).length).toBe(total);
		} finally {
			await sink.close();
		}
	});

	it('keeps the digests while the mail server is down and delivers each once when it is back', async () => {
		const before = (await readMailbox(mailDir)).length;
		const port = await freePort();
		configureMailTransport(`smtp://127.0.0.1:${port}`);
		// A van joins the fleet with a filter already past the line; the next night tells both sides.
		const fleet = await db.Organisation.findOne({ where: { name: 'Gorsefield Couriers' } });
		const late = await make.van(fleet!.id, 'GFC 5');
		await make.readings(
			late.id,
			new Date(now.getTime() + 6 * 86_400_000),
			12,
			3,
			(i) => 335 + (i % 3) * 4
		);
		const nextNight = new Date(now.getTime() + 7 * 86_400_000);
		const down = (await runJob(nextNight)) as { summary: Record<string, number> };
		expect(down.summary.messagesQueued).toBe(2);
		expect(down.summary.messagesSent).toBe(0);
		expect(await db.OutboxMessage.count({ where: { state: 'pending' } })).toBe(2);

		const sink = await startMailSink({ port, dir: mailDir });
		try {
			const later = new Date(nextNight.getTime() + retryDelayMs(1) + 1_000);
			expect((await deliverDueMail(later)).sent).toBe(2);
			expect((await deliverDueMail(new Date(later.getTime() + 86_400_000))).sent).toBe(0);
			const after = await readMailbox(mailDir);
			expect(after.length).toBe(before + 2);
			for (const email of ['manager@gorsefield.test', 'tech@hollin.test']) {
				const newest = (await digestsTo(email)).at(-1)!;
				expect(vansNamed(newest.text ?? '')).toEqual(['GFC 5']);
			}
		} finally {
			await sink.close();
		}
	});

	it('does the work once when two runs start at the same moment', async () => {
		const at = new Date(now.getTime() + 8 * 86_400_000);
		const before = await db.Forecast.count();
		const [a, b] = await Promise.all([runJob(at), runJob(at)]);
		expect([a.skipped, b.skipped].sort()).toEqual([false, true]);
		expect(await db.Forecast.count()).toBe(before + 4);
	});
});
