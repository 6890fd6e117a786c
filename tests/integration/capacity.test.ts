import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { factories } from './factories';

// Its own database: the test counts bays, closed days and audit rows of one workshop.
const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'sootcast-capacity-'));
process.env.DATABASE_URL = `sqlite:${path.join(dir, 'db.sqlite')}`;

const db = await import('../../src/lib/server/db');
const bookings = await import('../../src/lib/server/services/bookings');
const capacity = await import('../../src/lib/server/services/workshop-capacity');
type SessionUser = import('../../src/lib/server/auth/lucia').SessionUser;
type HoursInput = import('../../src/lib/validation/capacity').CapacityHoursInput;

// Wednesday 2 December 2026, 09:00 UTC (09:00 in London: GMT in winter).
const now = new Date(Date.UTC(2026, 11, 2, 9, 0));
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
let shopId = 0;
const vans: Record<string, number> = {};

const weekdays: HoursInput = {
	baysPerDay: 2,
	opensAt: '08:00',
	closesAt: '17:00',
	timeZone: 'Europe/London',
	openDays: [1, 2, 3, 4, 5]
};
const hours = (change: Partial<HoursInput>) =>
	capacity.saveHours(tech, { ...weekdays, ...change }, now);
const ask = (
	reg: string,
	startsAt: string,
	visitKind: 'inspection' | 'replacement' = 'inspection'
) =>
	bookings.requestVisit(
		manager,
		{ vehicleId: vans[reg], workshopId: shopId, visitKind, startsAt },
		now
	);
/** The field messages of a refused save, or a note that it was not refused. */
async function refusal(work: Promise<unknown>) {
	try {
		await work;
		return { message: 'not refused', fields: {} as Record<string, string> };
	} catch (err) {
		const e = err as Error & { fields?: Record<string, string> };
		return { message: e.message, fields: e.fields ?? {} };
	}
}
const audits = (action: string) => db.AuditLog.count({ where: { action } });

beforeAll(async () => {
	await db.migrate();
	const fleet = await make.organisation('Brackenholt Parcels', 'fleet');
	const shop = await make.organisation('Ludworth Exhaust Works', 'workshop');
	const stranger = await make.organisation('Nettlebank Motors', 'workshop');
	await make.contract(fleet.id, shop.id, '2025-01-01');
	manager = as(await make.person(fleet.id, 'planner@brackenholt.test', 'fleet_manager'));
	tech = as(await make.person(shop.id, 'bay@ludworth.test', 'workshop'));
	strangerTech = as(await make.person(stranger.id, 'bay@nettlebank.test', 'workshop'));
	shopId = shop.id;
	for (let i = 1; i <= 8; i++) vans[`BHP ${i}`] = (await make.van(fleet.id, `BHP ${i}`)).id;
});

describe('capacity settings', () => {
	it('show the standard capacity and every standard kind until the workshop saves its own', async () => {
		const s = await capacity.capacitySettings(tech, now);
		expect(s.capacity.isDefault).toBe(true);
		expect(s.today).toBe('2026-12-02');
		expect(s.capacity).toMatchObject({ baysPerDay: 2, opensAt: '08:00', closesAt: '17:00' });
		expect(s.kinds.map((k) => [k.kind, k.offered])).toEqual([
			['inspection', true],
			['sensor_check', true],
			['service_regen', true],
			['off_vehicle_cleaning', true],
			['replacement', true]
		]);
		expect(s.closedDays).toEqual([]);
	});

	it('are the workshop’s own: other roles are refused and another workshop’s closed day is not found', async () => {
		await expect(capacity.saveHours(manager, weekdays, now)).rejects.toThrow(
			"Only the workshop's own people change its capacity."
		);
		const { id } = await capacity.addClosedDay(
			tech,
			{ day: '2026-12-31', note: 'Stock-take' },
			now
		);
		await expect(capacity.removeClosedDay(strangerTech, id, now)).rejects.toThrow(
			'That closed day was not found.'
		);
		expect(await db.WorkshopClosedDay.count({ where: { id } })).toBe(1);
		await capacity.removeClosedDay(tech, id, now);
		expect(await db.WorkshopClosedDay.count({ where: { id } })).toBe(0);
		expect(await audits('capacity.closed_day_removed')).toBe(1);
	});

	it('refuse a closed day in the past, twice the same day, or years ahead', async () => {
		const day = async (d: string) =>
			(await refusal(capacity.addClosedDay(tech, { day: d, note: 'Holiday' }, now))).fields.day;
		expect(await day('2026-12-01')).toBe(
			'2026-12-01 has already passed. Choose today (2026-12-02) or a later date.'
		);
		expect(await day('2031-01-01')).toBe('Choose a date within the next two years.');
		await capacity.addClosedDay(tech, { day: '2026-12-24', note: 'Christmas Eve' }, now);
		expect(await day('2026-12-24')).toBe('You are already closed on 2026-12-24 (Christmas Eve).');
	});
});

describe('booking reads the saved capacity', () => {
	it('takes one visit a day once bays are set to 1', async () => {
		await hours({ baysPerDay: 1 });
		expect(await audits('capacity.hours_saved')).toBe(1);
		await ask('BHP 1', '2026-12-03T10:00');
		await expect(ask('BHP 2', '2026-12-03T13:00')).rejects.toThrow(
			'All 1 bays at Ludworth Exhaust Works are taken on 2026-12-03. Choose another day.'
		);
	});

	it('refuses a saved closed day with its own message', async () => {
		await capacity.addClosedDay(tech, { day: '2026-12-04', note: 'Stock-take' }, now);
		await expect(ask('BHP 2', '2026-12-04T10:00')).rejects.toThrow(
			'Ludworth Exhaust Works is closed on 2026-12-04 (Stock-take). Choose another day.'
		);
	});

	it('applies saved hours, zone and visit lengths', async () => {
		await hours({ baysPerDay: 1, opensAt: '09:00', closesAt: '16:00' });
		await expect(ask('BHP 2', '2026-12-07T08:30')).rejects.toThrow(
			'Ludworth Exhaust Works is open 09:00–16:00 (Europe/London time)'
		);
		await capacity.saveVisitKinds(
			tech,
			[
				{ kind: 'inspection', durationMinutes: 90, offered: true },
				{ kind: 'sensor_check', durationMinutes: 60, offered: true },
				{ kind: 'service_regen', durationMinutes: 120, offered: true },
				{ kind: 'off_vehicle_cleaning', durationMinutes: 240, offered: true },
				{ kind: 'replacement', durationMinutes: 180, offered: false }
			],
			now
		);
		const b = await ask('BHP 2', '2026-12-07T14:30');
		// 14:30 London (GMT) plus the saved 90 minutes.
		expect(b.endsAt!.toISOString()).toBe('2026-12-07T16:00:00.000Z');
		await expect(ask('BHP 3', '2026-12-08T10:00', 'replacement')).rejects.toThrow(
			'Ludworth Exhaust Works does not offer this kind of visit.'
		);
	});
});

describe('a change that would break standing visits', () => {
	it('is refused with the visits named, and nothing is saved', async () => {
		const [b1] = await bookings.listBookings(manager, { vehicleId: vans['BHP 1'] });
		await bookings.confirmBooking(tech, b1.id, now);
		const before = (await db.WorkshopCapacity.findByPk(shopId))!.get({ plain: true });
		const saved = await audits('capacity.hours_saved');

		const later = await refusal(hours({ baysPerDay: 1, opensAt: '11:00', closesAt: '17:00' }));
		expect(later.message).toBe('Not saved: these settings would break visits already booked.');
		expect(later.fields).toEqual({
			opensAt: '1 visit would fall outside 11:00–17:00: BHP 1 on 2026-12-03 10:00 (confirmed).'
		});
		// 3 December 2026 is a Thursday.
		const noThursdays = await refusal(hours({ baysPerDay: 1, openDays: [1, 2, 3, 5] }));
		expect(noThursdays.fields.openDays).toBe(
			'1 visit would fall on a day you close: BHP 1 on 2026-12-03 10:00 (confirmed).'
		);
		// UTC+14: 10:00 in London is already the next day there.
		const farZone = await refusal(hours({ baysPerDay: 1, timeZone: 'Pacific/Kiritimati' }));
		expect(farZone.fields.timeZone).toContain(
			'would move to another day: BHP 1 on 2026-12-04 00:00'
		);
		const tooShort = await refusal(hours({ baysPerDay: 1, opensAt: '09:00', closesAt: '12:00' }));
		expect(tooShort.fields.closesAt).toBe(
			'Open 09:00–12:00 is shorter than the longest visit you offer: off-vehicle filter cleaning takes 240 minutes.'
		);
		const closing = await refusal(
			capacity.addClosedDay(tech, { day: '2026-12-03', note: 'Training' }, now)
		);
		expect(closing.fields.day).toBe(
			'2026-12-03 already has 1 visit booked: BHP 1 on 2026-12-03 10:00 (confirmed). Move or cancel it first.'
		);
		const withdraw = await refusal(
			capacity.saveVisitKinds(
				tech,
				[
					{ kind: 'inspection', durationMinutes: 90, offered: false },
					{ kind: 'sensor_check', durationMinutes: 60, offered: true },
					{ kind: 'service_regen', durationMinutes: 120, offered: true },
					{ kind: 'off_vehicle_cleaning', durationMinutes: 240, offered: true },
					{ kind: 'replacement', durationMinutes: 180, offered: false }
				],
				now
			)
		);
		expect(withdraw.fields.offered_inspection).toMatch(
			/^Inspection with back-pressure test is still booked: BHP 1 on 2026-12-03 10:00 \(confirmed\), BHP 2 on 2026-12-07 14:30 \(requested\)\./
		);

		expect((await db.WorkshopCapacity.findByPk(shopId))!.get({ plain: true })).toEqual(before);
		expect(await db.WorkshopClosedDay.count({ where: { day: '2026-12-03' } })).toBe(0);
		expect(await audits('capacity.hours_saved')).toBe(saved);
	});

	it('refuses fewer bays than a day already holds, and compacts bay numbers when they fit', async () => {
		await hours({ baysPerDay: 3, opensAt: '09:00', closesAt: '16:00' });
		for (const [reg, at] of [
			['BHP 4', '2026-12-09T09:00'],
			['BHP 5', '2026-12-09T11:00'],
			['BHP 6', '2026-12-09T13:00']
		])
			await ask(reg, at);
		const crowded = await refusal(hours({ baysPerDay: 2, opensAt: '09:00', closesAt: '16:00' }));
		expect(crowded.fields.baysPerDay).toBe(
			'2026-12-09 already has more than 2 bays booked: BHP 4 on 2026-12-09 09:00 (requested), BHP 5 on 2026-12-09 11:00 (requested), BHP 6 on 2026-12-09 13:00 (requested).'
		);

		// Freeing bay 2 leaves bays 1 and 3 held: two bookings now fit two bays.
		const [middle] = await bookings.listBookings(manager, { vehicleId: vans['BHP 5'] });
		await bookings.cancelBooking(manager, middle.id, { reason: 'Van sold' }, now);
		await hours({ baysPerDay: 2, opensAt: '09:00', closesAt: '16:00' });
		const bays = await db.BookingSlot.findAll({
			where: { day: '2026-12-09' },
			order: [['bay', 'ASC']]
		});
		expect(bays.map((s) => s.bay)).toEqual([1, 2]);
		// Without the renumbering bay 2 would look free and a third visit would get in.
		await expect(ask('BHP 7', '2026-12-09T14:00')).rejects.toThrow(
			'All 2 bays at Ludworth Exhaust Works are taken on 2026-12-09. Choose another day.'
		);
	});

	it('records each saved change in the audit log with what it was before', async () => {
		const last = await db.AuditLog.findOne({
			where: { action: 'capacity.hours_saved' },
			order: [['id', 'DESC']]
		});
		expect(last!.userId).toBe(tech.id);
		expect(last!.organisationId).toBe(shopId);
		expect(last!.details).toMatchObject({
			before: { baysPerDay: 3 },
			after: { baysPerDay: 2, opensAt: '09:00', closesAt: '16:00', closedWeekdays: [6, 7] }
		});
		expect(await audits('capacity.closed_day_added')).toBe(3);
		expect(await audits('capacity.visit_kinds_saved')).toBe(1);
	});
});
