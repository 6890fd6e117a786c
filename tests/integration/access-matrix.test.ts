import { beforeAll, describe, expect, inject, it } from 'vitest';
import { Client } from './http';
import { DEMO_ACCOUNTS } from '../../src/lib/server/demo/scenario';

type Who = 'anon' | 'admin' | 'fleet' | 'otherFleet' | 'workshop' | 'otherWorkshop' | 'driver';
const EMAIL: Record<Exclude<Who, 'anon'>, string> = {
	admin: DEMO_ACCOUNTS.admin.email,
	fleet: DEMO_ACCOUNTS.fleetManager.email,
	otherFleet: DEMO_ACCOUNTS.otherFleetManager.email,
	workshop: DEMO_ACCOUNTS.workshop.email,
	otherWorkshop: DEMO_ACCOUNTS.otherWorkshop.email,
	driver: DEMO_ACCOUNTS.driver.email
};

const baseUrl = inject('baseUrl');
const clients = {} as Record<Who, Client>;
const ids = { larkspurDriversVan: 0, larkspurPoolVan: 0, thistledownVan: 0 };

beforeAll(async () => {
	process.env.DATABASE_URL = inject('databaseUrl');
	const { Vehicle, User, getDb } = await import('../../src/lib/server/db');
	getDb();
	const ida = await User.findOne({ where: { email: DEMO_ACCOUNTS.driver.email } });
	ids.larkspurDriversVan = (await Vehicle.findOne({ where: { driverId: ida!.id } }))!.id;
	ids.larkspurPoolVan = (await Vehicle.findOne({ where: { registration: 'LKD 440' } }))!.id;
	ids.thistledownVan = (await Vehicle.findOne({ where: { registration: 'TDU 71' } }))!.id;
	clients.anon = new Client(baseUrl);
	for (const who of Object.keys(EMAIL) as Exclude<Who, 'anon'>[]) {
		clients[who] = new Client(baseUrl);
		const res = await clients[who].signIn(EMAIL[who]);
		expect(res.status, `sign-in of ${who}`).toBe(303);
	}
});

// 'login' = redirected to the sign-in page. Another organisation's van answers 404 like a
// missing one, so guessing ids tells nothing.
type Expect = number | 'login';
interface Row {
	path: () => string;
	expect: Record<Who, Expect>;
}
const everyone = (
	v: Expect,
	overrides: Partial<Record<Who, Expect>> = {}
): Record<Who, Expect> => ({
	anon: 'login',
	admin: v,
	fleet: v,
	otherFleet: v,
	workshop: v,
	otherWorkshop: v,
	driver: v,
	...overrides
});

const rows: Row[] = [
	{ path: () => '/fleet', expect: everyone(403, { fleet: 200, otherFleet: 200 }) },
	{
		path: () => `/fleet/vans/${ids.larkspurPoolVan}`,
		expect: everyone(403, { fleet: 200, otherFleet: 404 })
	},
	{
		path: () => `/fleet/vans/${ids.thistledownVan}`,
		expect: everyone(403, { fleet: 404, otherFleet: 200 })
	},
	{ path: () => '/fleet/vans/99999999', expect: everyone(403, { fleet: 404, otherFleet: 404 }) },
	{ path: () => '/workshop', expect: everyone(403, { workshop: 200, otherWorkshop: 200 }) },
	// Copperbeech's contract with Larkspur has ended, so its van is no longer theirs to see.
	{
		path: () => `/workshop/vans/${ids.larkspurPoolVan}`,
		expect: everyone(403, { workshop: 200, otherWorkshop: 404 })
	},
	{
		path: () => `/workshop/vans/${ids.thistledownVan}`,
		expect: everyone(403, { workshop: 404, otherWorkshop: 200 })
	},
	{ path: () => '/driver', expect: everyone(403, { driver: 200 }) },
	{ path: () => '/admin', expect: everyone(403, { admin: 200 }) },
	{ path: () => '/settings', expect: everyone(200) },
	{ path: () => '/api/v1/vehicles', expect: everyone(200, { anon: 401, admin: 403 }) },
	{
		path: () => `/api/v1/vehicles/${ids.larkspurDriversVan}`,
		expect: everyone(200, { anon: 401, admin: 403, otherFleet: 404, otherWorkshop: 404 })
	},
	{
		path: () => `/api/v1/vehicles/${ids.larkspurPoolVan}`,
		expect: everyone(200, {
			anon: 401,
			admin: 403,
			otherFleet: 404,
			otherWorkshop: 404,
			driver: 404
		})
	},
	{
		path: () => `/api/v1/vehicles/${ids.thistledownVan}`,
		expect: everyone(404, { anon: 401, admin: 403, otherFleet: 200, otherWorkshop: 200 })
	}
];

describe('role × route access matrix', () => {
	for (const row of rows) {
		for (const who of [
			'anon',
			'admin',
			'fleet',
			'otherFleet',
			'workshop',
			'otherWorkshop',
			'driver'
		] as Who[]) {
			it(`${who} requesting ${row.path.toString().replace(/^\(\) => /, '')} gets ${row.expect[who]}`, async () => {
				const res = await clients[who].request(row.path(), { headers: { accept: 'text/html' } });
				const expected = row.expect[who];
				if (expected === 'login') {
					expect(res.status).toBe(303);
					expect(res.headers.get('location')).toMatch(/^\/login\?redirectTo=/);
				} else {
					expect(res.status).toBe(expected);
				}
			});
		}
	}

	it('a signed-out form post to a signed-in area is sent to sign in, and changes nothing', async () => {
		const res = await clients.anon.request('/settings?/save', {
			method: 'POST',
			headers: { 'content-type': 'application/x-www-form-urlencoded', accept: 'text/html' },
			body: new URLSearchParams({ name: 'Intruder', unitPreference: 'psi' })
		});
		expect(res.status).toBe(303);
		expect(res.headers.get('location')).toMatch(/^\/login/);
	});

	it("a van list never carries another fleet's registrations", async () => {
		const res = await clients.workshop.request('/api/v1/vehicles?pageSize=100');
		const body = (await res.json()) as { items: { registration: string }[]; total: number };
		expect(body.total).toBe(40);
		expect(body.items.every((v) => v.registration.startsWith('LKD'))).toBe(true);
	});

	it('no page or API answer carries a password hash', async () => {
		for (const path of ['/settings', `/api/v1/vehicles/${ids.larkspurDriversVan}`, '/admin']) {
			const who: Who = path === '/admin' ? 'admin' : 'fleet';
			const text = await (await clients[who].request(path)).text();
			expect(text).not.toMatch(/\$argon2id\$/);
			expect(text).not.toMatch(/passwordHash|password_hash/);
		}
	});
});
