import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import ICAL from 'ical.js';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { factories } from './factories';
import { createTestDatabase } from './test-database';
import { readMailbox, recipients } from './mail';

// Its own database and mail sink: the test counts bookings, bays and messages.
const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'sootcast-bookings-'));
const database = await createTestDatabase('bookings');
process.env.DATABASE_URL = database.url;
process.env.PUBLIC_URL = 'http://sootcast.test';

const db = await import('../../src/lib/server/db');
const { configureMailTransport } = await import('../../src/lib/server/mail/mailer');
const { startMailSink } = await import('../../src/lib/server/mail/sink');
const { deliverDueMail } = await import('../../src/lib/server/services/outbox');
const bookings = await import('../../src/lib/server/services/bookings');
type SessionUser = import('../../src/lib/server/auth/lucia').SessionUser;

// Wednesday 2 December 2026, 09:00 UTC.
const now = new Date(Date.UTC(2026, 11, 2, 9, 0));
const mailDir = path.join(dir, 'mail');
const make = factories(db);
const as = (u: InstanceType<typeof db.User>): SessionUser => ({
	id: u.id,
	email: u.email,
	name: u.name,
	role: u.role,
	organisationId: u.organisationId,
	unitPreference: 'mbar',
	locale: 'en-GB',
	timeZone: 'Europe/London'
});
let manager: SessionUser, tech: SessionUser, strangerTech: SessionUser;
const vans: Record<string, number> = {};
const shops: Record<string, number> = {};
let winner = '';
let sink: Awaited<ReturnType<typeof startMailSink>>;

beforeAll(async () => {
	await db.migrate();
	sink = await startMailSink({ port: 0, dir: mailDir });
	configureMailTransport(`smtp://127.0.0.1:${sink.port}`);
	const fleet = await make.organisation('Brackenholt Parcels', 'fleet');
	const shop = await make.organisation('Ludworth Exhaust Works', 'workshop');
	const stranger = await make.organisation('Nettlebank Motors', 'workshop');
	await make.contract(fleet.id, shop.id, '2025-01-01');
	manager = as(await make.person(fleet.id, 'planner@brackenholt.test', 'fleet_manager'));
	tech = as(await make.person(shop.id, 'bay@ludworth.test', 'workshop'));
	strangerTech = as(await make.person(stranger.id, 'bay@nettlebank.test', 'workshop'));
	// One bay, 08:00–17:00 Berlin time, closed Saturdays and Sundays and on 24 December.
	await db.WorkshopCapacity.create({
		workshopId: shop.id,
		baysPerDay: 1,
		opensAt: '08:00',
		closesAt: '17:00',
		closedWeekdays: [6, 7],
		timeZone: 'Europe/Berlin'
	});
	await db.WorkshopClosedDay.create({
		workshopId: shop.id,
		day: '2026-12-24',
		note: 'Christmas Eve'
	});
	for (const reg of ['BHP 1', 'BHP 2', 'BHP 3', 'BHP 4'])
		vans[reg] = (await make.van(fleet.id, reg)).id;
	Object.assign(shops, { shop: shop.id, stranger: stranger.id });
});

afterAll(async () => {
	await sink?.close?.();
	await db.closeDb();
	await database.drop();
});

const ask = (reg: string, startsAt: string, workshopId = shops.shop) =>
	bookings.requestVisit(
		manager,
		{ vehicleId: vans[reg], workshopId, visitKind: 'inspection', startsAt },
		now
	);

function parseIcs(text: string) {
	const cal = new ICAL.Component(ICAL.parse(text));
	const event = new ICAL.Event(cal.getFirstSubcomponent('vevent')!);
	return {
		method: cal.getFirstPropertyValue('method'),
		event,
		status: event.component.getFirstPropertyValue('status')
	};
}

async function invitationsFor(uid: string) {
	await deliverDueMail(new Date(now.getTime() + 1000));
	// Each booking change also kicks an immediate delivery in the background, which may still be
	// sending a message it claimed: wait (bounded) until the outbox holds nothing unsent.
	const until = Date.now() + 30_000;
	while ((await db.OutboxMessage.count({ where: { state: 'pending' } })) > 0) {
		if (Date.now() > until) throw new Error('The outbox still holds unsent messages after 30 s.');
		await new Promise((r) => setTimeout(r, 100));
	}
	const mails = await readMailbox(mailDir);
	return mails
		.flatMap((m) =>
			m.attachments
				.filter((a) => a.filename === 'visit.ics')
				.map((a) => ({ to: recipients(m), ics: parseIcs(a.content.toString('utf8')) }))
		)
		.filter((x) => x.ics.event.uid === uid);
}

describe('booking a visit against capacity', () => {
	it('lets exactly one of two simultaneous requests take the last bay', async () => {
		const results = await Promise.allSettled([
			ask('BHP 1', '2026-12-03T10:00'),
			ask('BHP 2', '2026-12-03T13:00')
		]);
		const won = results.filter((r) => r.status === 'fulfilled');
		winner = won[0]?.value.registration ?? '';
		const lost = results.filter((r): r is PromiseRejectedResult => r.status === 'rejected');
		expect(won).toHaveLength(1);
		expect(lost).toHaveLength(1);
		expect(lost[0].reason.message).toBe(
			'All 1 bays at Ludworth Exhaust Works are taken on 2026-12-03. Choose another day.'
		);
		expect(await db.Booking.count()).toBe(1);
		expect(await db.BookingSlot.count({ where: { day: '2026-12-03' } })).toBe(1);
	});

	it('has a unique (workshop, day, bay) index as the backstop', async () => {
		const held = await db.BookingSlot.findOne({ where: { day: '2026-12-03' } });
		await expect(
			db.BookingSlot.create({
				bookingId: held!.bookingId,
				workshopId: held!.workshopId,
				day: held!.day,
				bay: held!.bay
			})
		).rejects.toThrow();
	});

	it('refuses bad input, each with its own message', async () => {
		await expect(ask('BHP 3', '2026-12-01T10:00')).rejects.toThrow(
			'That time has already passed. Choose a time later than now.'
		);
		await expect(ask('BHP 3', '2026-12-05T10:00')).rejects.toThrow(
			'Ludworth Exhaust Works is closed on Saturdays. Choose another day.'
		);
		await expect(ask('BHP 3', '2026-12-24T10:00')).rejects.toThrow(
			'Ludworth Exhaust Works is closed on 2026-12-24 (Christmas Eve). Choose another day.'
		);
		await expect(ask('BHP 3', '2026-12-04T16:30')).rejects.toThrow(
			'Ludworth Exhaust Works is open 08:00–17:00 (Europe/Berlin time); a 60-minute inspection with back-pressure test must start and finish within those hours.'
		);
		await expect(ask('BHP 3', '2026-12-04T10:00', shops.stranger)).rejects.toThrow(
			'Nettlebank Motors has no active contract with your fleet, so it cannot take BHP 3.'
		);
		await expect(ask(winner, '2026-12-07T10:00')).rejects.toThrow(
			`${winner} already has an open visit; reschedule or cancel that one instead.`
		);
		// The other workshop cannot even see the booking.
		const [held] = await bookings.listBookings(manager, { vehicleId: vans[winner] });
		await expect(bookings.confirmBooking(strangerTech, held.id, now)).rejects.toThrow(
			'That visit was not found.'
		);
	});

	it('mails both sides an invitation with a stable UID, a rising SEQUENCE and CANCEL at the end', async () => {
		const b = await ask('BHP 4', '2026-12-04T10:00');
		expect(b.state).toBe('requested');
		await bookings.confirmBooking(tech, b.id, now);
		await bookings.rescheduleBooking(
			manager,
			b.id,
			{ startsAt: '2026-12-08T09:30', reason: 'Van needed for a Friday delivery run' },
			now
		);
		await expect(bookings.confirmBooking(manager, b.id, now)).rejects.toThrow(
			'The workshop has not answered this request yet.'
		);
		await bookings.cancelBooking(tech, b.id, { reason: 'Technician off sick' }, now);
		await expect(bookings.confirmBooking(tech, b.id, now)).rejects.toThrow(
			'This visit was cancelled, so it cannot be changed. Request a new visit instead.'
		);

		const invites = await invitationsFor(b.uid);
		for (const who of ['planner@brackenholt.test', 'bay@ludworth.test']) {
			const mine = invites
				.filter((i) => i.to.includes(who))
				.sort((x, y) => x.ics.event.sequence - y.ics.event.sequence);
			// RFC 5545 §3.8.7.4 SEQUENCE: 0 at creation, raised with each revision (request, confirm, reschedule, cancel).
			expect(
				mine.map((i) => i.ics.event.sequence),
				who
			).toEqual([0, 1, 2, 3]);
			// RFC 5546 §1.4 / RFC 5545 §3.7.2 METHOD: REQUEST while the visit stands, CANCEL once called off.
			expect(mine.map((i) => i.ics.method)).toEqual(['REQUEST', 'REQUEST', 'REQUEST', 'CANCEL']);
			// RFC 5545 §3.8.1.11 STATUS.
			expect(mine.map((i) => i.ics.status)).toEqual([
				'TENTATIVE',
				'CONFIRMED',
				'TENTATIVE',
				'CANCELLED'
			]);
			// RFC 5545 §3.8.2.4 DTSTART: 10:00 in Berlin (UTC+1 in December) is 09:00 UTC; 09:30 on 8 December is 08:30 UTC.
			expect(mine[0].ics.event.startDate.toJSDate().toISOString()).toBe('2026-12-04T09:00:00.000Z');
			expect(mine[2].ics.event.startDate.toJSDate().toISOString()).toBe('2026-12-08T08:30:00.000Z');
			// RFC 5545 §3.8.2.2 DTEND: a 60-minute inspection (the default length in domain/visits.ts).
			expect(mine[2].ics.event.endDate.toJSDate().toISOString()).toBe('2026-12-08T09:30:00.000Z');
		}
		const changes = await db.BookingChange.findAll({
			where: { bookingId: b.id },
			order: [['id', 'ASC']]
		});
		expect(changes.map((c) => [c.action, c.userId])).toEqual([
			['requested', manager.id],
			['confirmed', tech.id],
			['rescheduled', manager.id],
			['cancelled', tech.id]
		]);
		expect(await db.BookingSlot.count({ where: { bookingId: b.id } })).toBe(0);
	});
});

describe('a visit report', () => {
	it('turns a cleaning into an event that starts a new baseline at the next forecast, and mails the fleet', async () => {
		const { forecastVehicle } = await import('../../src/lib/server/services/forecasts');
		const reports = await import('../../src/lib/server/services/visit-reports');
		const van = vans['BHP 3'];
		await make.readings(van, now, 12, 3, (i) => 180 + i * 8);
		const before = await forecastVehicle(van, now);
		expect(before.forecast.series.epochStartAt).toBeNull();

		const b = await ask('BHP 3', '2026-12-09T10:00');
		const report = {
			visitedAt: new Date(Date.UTC(2026, 11, 9, 9, 30)),
			findings: 'Heavy ash load',
			actions: ['filter_cleaning' as const],
			idleBeforeMbar: 95,
			idleAfterMbar: 22,
			rootCause: { usage: 'Mostly short urban drops' },
			signOff: true
		};
		const later = new Date(Date.UTC(2026, 11, 9, 12, 0));
		await expect(reports.createVisitReport(tech, b.id, report, later)).rejects.toThrow(
			'Only a confirmed visit can be reported. Confirm it first, or request a new one.'
		);
		await bookings.confirmBooking(tech, b.id, now);
		await expect(
			reports.createVisitReport(
				tech,
				b.id,
				{ ...report, visitedAt: new Date(later.getTime() + 3_600_000) },
				later
			)
		).rejects.toThrow('The visit time cannot be in the future.');
		const saved = await reports.createVisitReport(tech, b.id, report, later);

		const events = await db.VehicleEvent.findAll({
			where: { vehicleId: van, visitReportId: saved.id },
			raw: true
		});
		expect(events.map((e) => [e.kind, e.source])).toEqual([['filter_cleaning', 'visit']]);
		const visitReadings = await db.Reading.count({ where: { vehicleId: van, source: 'visit' } });
		expect(visitReadings).toBe(2);
		// The report itself ran the forecast: its stored epoch starts at the cleaning.
		const stored = await db.Forecast.findOne({
			where: { vehicleId: van },
			order: [['id', 'DESC']]
		});
		expect(stored!.computedAt.toISOString()).toBe(later.toISOString());
		expect((stored!.details as { epochStartAt: string | null }).epochStartAt).toBe(
			'2026-12-09T09:30:00.000Z'
		);
		expect((await db.Booking.findByPk(b.id))!.state).toBe('done');
		await expect(reports.createVisitReport(tech, b.id, report, later)).rejects.toThrow(
			'This visit already has its report.'
		);

		await deliverDueMail(new Date(later.getTime() + 1000));
		const mail = (await readMailbox(mailDir)).find(
			(m) => m.subject === 'Visit report for BHP 3 from Ludworth Exhaust Works'
		);
		expect(recipients(mail!)).toEqual(['planner@brackenholt.test']);
		expect(mail!.text).toContain('Done: Off-vehicle filter cleaning.');
		expect(mail!.text).toContain(`http://sootcast.test/fleet/reports/${saved.id}`);
	});
});
