import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { factories } from './factories';
import { createTestDatabase } from './test-database';
import { readMailbox, recipients } from './mail';

const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'sootcast-advice-job-'));
const database = await createTestDatabase('advice_job');
process.env.DATABASE_URL = database.url;
process.env.PUBLIC_URL = 'http://sootcast.test';
process.env.APP_SECRET = 'advice-tests-secret-0123456789abcdefghij';

const db = await import('../../src/lib/server/db');
const { configureMailTransport } = await import('../../src/lib/server/mail/mailer');
const { startMailSink } = await import('../../src/lib/server/mail/sink');
const advice = await import('../../src/lib/server/services/driver-advice');
const { deliverDueMail } = await import('../../src/lib/server/services/outbox');

const monday = new Date(Date.UTC(2026, 10, 30, 6, 30));
const make = factories(db);
const mailDir = path.join(dir, 'mail');
const ids: Record<string, number> = {};

afterAll(async () => {
	await db.closeDb();
	await database.drop();
});

beforeAll(async () => {
	await db.migrate();
	const fleet = await make.organisation('Brackenholt Removals', 'fleet');
	const busy = await make.person(fleet.id, 'busy.driver@brackenholt.test', 'driver');
	const out = await make.person(fleet.id, 'opted.out@brackenholt.test', 'driver', {
		adviceOptOut: true
	});
	const idle = await make.person(fleet.id, 'no.trips@brackenholt.test', 'driver');
	for (const [person, reg] of [
		[busy, 'BRH 1'],
		[out, 'BRH 2'],
		[idle, 'BRH 3']
	] as const) {
		const van = await db.Vehicle.create({
			organisationId: fleet.id,
			registration: reg,
			driverId: person.id
		});
		ids[reg] = van.id;
	}
	// Last week: nine short hops a day on Tuesday–Friday, no long steady run.
	const trips = [];
	for (let day = 1; day <= 4; day++) {
		for (let k = 0; k < 9; k++) {
			const start = new Date(monday.getTime() - (7 - day) * 86_400_000 + (8 + k) * 3_600_000);
			trips.push({
				vehicleId: ids['BRH 1'],
				driverId: busy.id,
				startedAt: start,
				endedAt: new Date(start.getTime() + 9 * 60_000),
				distanceKm: 3.5,
				idleMinutes: 2,
				meanSpeedKmh: 23
			});
			trips.push({
				vehicleId: ids['BRH 2'],
				driverId: out.id,
				startedAt: start,
				endedAt: new Date(start.getTime() + 9 * 60_000),
				distanceKm: 3.5,
				idleMinutes: 2,
				meanSpeedKmh: 23
			});
		}
	}
	await db.Trip.bulkCreate(trips);
	Object.assign(ids, { busy: busy.id, out: out.id });
});

describe('the weekly driver advice', () => {
	it('sends one short note to each driver with trips, none to those who opted out, and nothing twice in a week', async () => {
		const sink = await startMailSink({ port: 0, dir: mailDir });
		configureMailTransport(`smtp://127.0.0.1:${sink.port}`);
		try {
			const first = await advice.queueWeeklyAdvice(monday);
			expect(first).toEqual({ drivers: 2, queued: 1, skippedNoTrips: 1 });
			await deliverDueMail(monday);
			const mails = await readMailbox(mailDir);
			expect(mails.map((m) => recipients(m)[0])).toEqual(['busy.driver@brackenholt.test']);
			const text = mails[0].text ?? '';
			// 36 short trips, none long enough: the note says so and asks for one steady run.
			expect(text).toContain(
				'0 of your 36 trips last week were long enough for the filter to clean itself.'
			);
			expect(text).toMatch(/One \d+-minute run at steady speed/);
			expect(text).toContain('36 of your 36 trips were short hops');
			expect(JSON.stringify(mails[0].headers.get('list'))).toContain(
				'http://sootcast.test/unsubscribe/'
			);

			const again = await advice.queueWeeklyAdvice(new Date(monday.getTime() + 3 * 3_600_000));
			expect(again.queued).toBe(0);
		} finally {
			await sink.close();
		}
	});

	it('accepts only its own signature on the unsubscribe link', async () => {
		const token = advice.unsubscribeToken(ids.busy);
		expect(advice.verifyUnsubscribeToken(token)).toBe(ids.busy);
		expect(advice.verifyUnsubscribeToken(`${ids.out}.${token.split('.')[1]}`)).toBeNull();
		expect(advice.verifyUnsubscribeToken('1.short')).toBeNull();
		expect(await advice.unsubscribeFromAdvice(`${ids.busy}.${'A'.repeat(32)}`)).toBe(false);
		expect(await advice.unsubscribeFromAdvice(token)).toBe(true);
		expect((await db.User.findByPk(ids.busy))!.adviceOptOut).toBe(true);
		expect(
			(await advice.queueWeeklyAdvice(new Date(monday.getTime() + 8 * 86_400_000))).queued
		).toBe(0);
	});

	it('labels weeks the ISO 8601 way', () => {
		// ISO 8601 week dates: 2026-01-01 is a Thursday, so it falls in 2026-W01; 2027-01-01
		// (a Friday) belongs to 2026-W53. Calendar facts, checked against a printed 2026 calendar.
		expect(advice.isoWeek(new Date(Date.UTC(2026, 0, 1)))).toBe('2026-W01');
		expect(advice.isoWeek(new Date(Date.UTC(2027, 0, 1)))).toBe('2026-W53');
		expect(advice.isoWeek(monday)).toBe('2026-W49');
	});
});
