import { beforeAll, describe, expect, inject, it } from 'vitest';
import { Client } from './http';
import { DEMO_ACCOUNTS } from '../../src/lib/server/demo/scenario';
import { boardPageSchema, type BoardRow } from '../../src/lib/validation/board';
import { suggestedVisitWindow } from '../../src/lib/domain/visits';

const baseUrl = inject('baseUrl');
type Who = 'workshop' | 'otherWorkshop' | 'fleet' | 'driver' | 'admin';
const EMAIL: Record<Who, string> = {
	workshop: DEMO_ACCOUNTS.workshop.email,
	otherWorkshop: DEMO_ACCOUNTS.otherWorkshop.email,
	fleet: DEMO_ACCOUNTS.fleetManager.email,
	driver: DEMO_ACCOUNTS.driver.email,
	admin: DEMO_ACCOUNTS.admin.email
};
const clients = {} as Record<Who, Client>;
let db: typeof import('../../src/lib/server/db');
const orgs = { fenwright: 0, copperbeech: 0 };

const form = (fields: Record<string, string | string[]>): RequestInit => {
	const body = new URLSearchParams();
	for (const [k, v] of Object.entries(fields))
		for (const one of Array.isArray(v) ? v : [v]) body.append(k, one);
	return {
		method: 'POST',
		headers: { 'content-type': 'application/x-www-form-urlencoded', accept: 'text/html' },
		body
	};
};
const capacityPost = (who: Who, action: string, fields: Record<string, string | string[]>) =>
	clients[who].request(`/workshop/capacity?/${action}`, form(fields));

/** A weekday (Monday to Friday) `ahead` days or more from today, 'YYYY-MM-DD'. */
function weekdayAhead(ahead: number): string {
	const d = new Date(Date.now() + ahead * 86_400_000);
	while (d.getUTCDay() === 0 || d.getUTCDay() === 6) d.setUTCDate(d.getUTCDate() + 1);
	return d.toISOString().slice(0, 10);
}
const capacityOf = async (id: number) =>
	(await db.WorkshopCapacity.findByPk(id))!.get({ plain: true });

beforeAll(async () => {
	process.env.DATABASE_URL = inject('databaseUrl');
	db = await import('../../src/lib/server/db');
	db.getDb();
	const find = (name: string) => db.Organisation.findOne({ where: { name } });
	orgs.fenwright = (await find('Fenwright Diesel Clinic'))!.id;
	orgs.copperbeech = (await find('Copperbeech Van Care'))!.id;
	// The board's forecast columns come from the forecast job; run it now for Larkspur's vans.
	const { forecastVehicles } = await import('../../src/lib/server/services/forecasts');
	const larkspur = await find('Larkspur Lane Deliveries');
	const vans = await db.Vehicle.findAll({ where: { organisationId: larkspur!.id } });
	await forecastVehicles(
		vans.map((v) => v.id),
		new Date()
	);
	for (const who of Object.keys(EMAIL) as Who[]) {
		clients[who] = new Client(baseUrl);
		expect((await clients[who].signIn(EMAIL[who])).status, who).toBe(303);
	}
});

describe('the capacity page', () => {
	it('is for workshop people only', async () => {
		for (const who of ['workshop', 'otherWorkshop'] as const)
			expect((await clients[who].request('/workshop/capacity')).status, who).toBe(200);
		for (const who of ['fleet', 'driver', 'admin'] as const) {
			expect((await clients[who].request('/workshop/capacity')).status, who).toBe(403);
			const post = await capacityPost(who, 'hours', {
				baysPerDay: '9',
				opensAt: '06:00',
				closesAt: '20:00',
				timeZone: 'Europe/London',
				openDays: ['1', '2', '3', '4', '5', '6', '7']
			});
			expect(post.status, who).toBe(403);
		}
		const anon = await new Client(baseUrl).request('/workshop/capacity');
		expect(anon.status).toBe(303);
		expect(anon.headers.get('location')).toBe('/login?redirectTo=%2Fworkshop%2Fcapacity');
		expect(await capacityOf(orgs.fenwright)).toMatchObject({ baysPerDay: 3, opensAt: '07:30' });
	});

	it('shows each refused value’s message beside its field and saves nothing', async () => {
		const before = await capacityOf(orgs.fenwright);
		const bad = await capacityPost('workshop', 'hours', {
			baysPerDay: '0',
			opensAt: '07:30',
			closesAt: '17:30',
			timeZone: 'Mars/Olympus'
		});
		expect(bad.status).toBe(400);
		const html = await bad.text();
		for (const [field, message] of [
			['baysPerDay', 'Bays per day must be between 1 and 50'],
			['timeZone', 'Choose a time zone from the list, e.g. Europe/London'],
			['openDays', 'Choose at least one day you are open']
		])
			expect(html).toMatch(new RegExp(`id="field-${field}-error"[^>]*>\\s*${message}`));
		expect(html).toContain('aria-invalid="true"');

		const backwards = await capacityPost('workshop', 'hours', {
			baysPerDay: '3',
			opensAt: '17:00',
			closesAt: '08:00',
			timeZone: 'Europe/London',
			openDays: ['1', '2', '3', '4', '5']
		});
		expect(backwards.status).toBe(400);
		expect(await backwards.text()).toContain('Closing time must be after opening time');

		const past = await capacityPost('workshop', 'addClosedDay', {
			day: '2020-01-06',
			note: 'Too late'
		});
		expect(past.status).toBe(400);
		expect(await past.text()).toContain('2020-01-06 has already passed.');

		const kinds = await capacityPost('workshop', 'kinds', {
			minutes_inspection: '50',
			offered_inspection: 'on',
			minutes_sensor_check: '60',
			minutes_service_regen: '120',
			minutes_off_vehicle_cleaning: '240',
			minutes_replacement: '180'
		});
		expect(kinds.status).toBe(400);
		expect(await kinds.text()).toContain(
			'The length of an inspection must be a multiple of 15 minutes'
		);
		expect(await capacityOf(orgs.fenwright)).toEqual(before);
	});

	it('keeps each workshop’s closed days and capacity out of the other’s reach', async () => {
		const day = weekdayAhead(200);
		const added = await capacityPost('workshop', 'addClosedDay', { day, note: 'Open day' });
		expect(added.status).toBe(303);
		const closed = await db.WorkshopClosedDay.findOne({
			where: { workshopId: orgs.fenwright, day }
		});
		expect(closed!.note).toBe('Open day');

		// Another workshop: "not found", as if the day did not exist.
		expect(
			(await clients.otherWorkshop.request(`/workshop/capacity?remove=${closed!.id}`)).status
		).toBe(404);
		const theirs = await capacityPost('otherWorkshop', 'removeClosedDay', {
			closedDayId: String(closed!.id)
		});
		expect(theirs.status).toBe(404);
		expect(await db.WorkshopClosedDay.count({ where: { id: closed!.id } })).toBe(1);

		// Its own workshop is asked first, then removes it.
		const ask = await clients.workshop.request(`/workshop/capacity?remove=${closed!.id}`);
		expect(await ask.text()).toContain('Open again on');
		const removed = await capacityPost('workshop', 'removeClosedDay', {
			closedDayId: String(closed!.id)
		});
		expect(removed.status).toBe(303);
		expect(await db.WorkshopClosedDay.count({ where: { id: closed!.id } })).toBe(0);

		// Saving Copperbeech's hours leaves Fenwright's as they were.
		const fenwright = await capacityOf(orgs.fenwright);
		const copperbeech = await capacityOf(orgs.copperbeech);
		const week = ['1', '2', '3', '4', '5', '6'];
		const save = (bays: number) =>
			capacityPost('otherWorkshop', 'hours', {
				baysPerDay: String(bays),
				opensAt: '08:00',
				closesAt: '16:00',
				timeZone: 'Europe/London',
				openDays: week
			});
		expect((await save(4)).status).toBe(303);
		expect((await capacityOf(orgs.copperbeech)).baysPerDay).toBe(4);
		expect(await capacityOf(orgs.fenwright)).toEqual(fenwright);
		expect((await save(copperbeech.baysPerDay)).status).toBe(303);
	});
});

describe('requesting a visit from the risk board', () => {
	const board = async (who: Who) => {
		const res = await clients[who].request('/api/v1/board?pageSize=100');
		expect(res.status).toBe(200);
		return boardPageSchema.parse(await res.json()).items;
	};

	it('offers a request per van, then shows the standing visit, scoped to who asks', async () => {
		const van = (await board('fleet')).find(
			(v) => v.openVisit === null && v.crossingEarliest !== null
		) as BoardRow;
		expect(van).toBeDefined();
		const window = suggestedVisitWindow(new Date(), {
			crossingEarliest: new Date(van.crossingEarliest!),
			overLine: false
		});
		expect(van.suggestedVisitBy).toBe(window.to.toISOString());
		expect(van.visitUrgent).toBe(window.urgent);
		// A van already past the line is asked for as soon as possible, never given weeks. (The
		// shared database's short demo history has none, so one van's status is set for a moment.)
		const other = (await board('fleet')).find((v) => v.id !== van.id && v.openVisit === null)!;
		const saved = (await db.VehicleStatus.findByPk(other.id))!.get({ plain: true });
		await db.VehicleStatus.update(
			{ status: 'over_line', crossingEarliest: null },
			{ where: { vehicleId: other.id } }
		);
		try {
			const over = (await board('fleet')).find((v) => v.id === other.id)!;
			expect(over.visitUrgent).toBe(true);
			expect(Date.parse(over.suggestedVisitBy!) - Date.now()).toBeLessThan(4 * 86_400_000);
			const page = await (await clients.fleet.request(`/fleet/vans/${other.id}/visit`)).text();
			expect(page).toContain('Suggested window: <strong>as soon as possible</strong>');
			expect(page).toContain('already over the concern line');
		} finally {
			await db.VehicleStatus.update(
				{ status: saved.status, crossingEarliest: saved.crossingEarliest },
				{ where: { vehicleId: other.id } }
			);
		}
		expect(await (await clients.fleet.request('/fleet')).text()).toContain(
			`href="/fleet/vans/${van.id}/visit"`
		);

		const day = weekdayAhead(3);
		const requested = await clients.fleet.request(
			`/fleet/vans/${van.id}/visit?/request`,
			form({
				workshopId: String(orgs.fenwright),
				visitKind: 'inspection',
				startsAt: `${day}T10:00`
			})
		);
		expect(requested.status).toBe(303);
		const bookingId = Number(/\/fleet\/visits\/(\d+)/.exec(requested.headers.get('location')!)![1]);

		const after = (await board('fleet')).find((v) => v.id === van.id)!;
		expect(after.openVisit).toEqual({ id: bookingId, state: 'requested' });
		expect(await (await clients.fleet.request('/fleet')).text()).toContain(
			`href="/fleet/visits/${bookingId}"`
		);
		const atFenwright = (await board('workshop')).find((v) => v.id === van.id)!;
		expect(atFenwright.openVisit).toEqual({ id: bookingId, state: 'requested' });

		// The workshop cannot close that day while the visit stands; the refusal names the van.
		const closing = await capacityPost('workshop', 'addClosedDay', { day, note: 'Training' });
		expect(closing.status).toBe(400);
		const refusal = await closing.text();
		expect(refusal).toContain(`${day} already has`);
		expect(refusal).toContain(`${van.registration} on ${day} 10:00 (requested)`);

		const cancelled = await clients.fleet.request(
			`/fleet/visits/${bookingId}?/cancel`,
			form({ cancelReason: 'Planned by the integration test only' })
		);
		expect(cancelled.status).toBe(303);
		expect((await board('fleet')).find((v) => v.id === van.id)!.openVisit).toBeNull();
	});
});
