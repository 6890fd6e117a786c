import { beforeAll, describe, expect, inject, it } from 'vitest';
import { Client } from './http';
import { DEMO_ACCOUNTS } from '../../src/lib/server/demo/scenario';

const baseUrl = inject('baseUrl');
let admin: Client;
let db: typeof import('../../src/lib/server/db');

const form = (fields: Record<string, string>): RequestInit => ({
	method: 'POST',
	headers: { 'content-type': 'application/x-www-form-urlencoded', accept: 'text/html' },
	body: new URLSearchParams(fields)
});

beforeAll(async () => {
	process.env.DATABASE_URL = inject('databaseUrl');
	db = await import('../../src/lib/server/db');
	db.getDb();
	admin = new Client(baseUrl);
	await admin.signIn(DEMO_ACCOUNTS.admin.email);
});

describe('administration', () => {
	it('adds an organisation and a contract, and ends the contract', async () => {
		expect(
			(
				await admin.request(
					'/admin?/createOrganisation',
					form({ name: 'Wyvern Parcels', kind: 'fleet' })
				)
			).status
		).toBe(303);
		const dup = await admin.request(
			'/admin?/createOrganisation',
			form({ name: 'Wyvern Parcels', kind: 'fleet' })
		);
		expect(dup.status).toBe(400);
		expect(await dup.text()).toContain('An organisation with that name exists already');

		const fleet = await db.Organisation.findOne({ where: { name: 'Wyvern Parcels' } });
		const workshop = await db.Organisation.findOne({ where: { name: 'Fenwright Diesel Clinic' } });
		const backwards = await admin.request(
			'/admin?/createContract',
			form({
				fleetId: String(fleet!.id),
				workshopId: String(workshop!.id),
				startsOn: '2026-06-01',
				endsOn: '2026-05-01'
			})
		);
		expect(await backwards.text()).toContain('The last day cannot be before the first');
		const wrongKind = await admin.request(
			'/admin?/createContract',
			form({
				fleetId: String(workshop!.id),
				workshopId: String(workshop!.id),
				startsOn: '2026-06-01'
			})
		);
		expect(await wrongKind.text()).toContain('Choose a fleet');

		expect(
			(
				await admin.request(
					'/admin?/createContract',
					form({
						fleetId: String(fleet!.id),
						workshopId: String(workshop!.id),
						startsOn: '2026-06-01'
					})
				)
			).status
		).toBe(303);
		const contract = await db.Contract.findOne({ where: { fleetId: fleet!.id } });
		expect(contract!.endsOn).toBeNull();
		expect(
			(
				await admin.request(
					'/admin?/endContract',
					form({ contractId: String(contract!.id), endsOn: '2026-09-30' })
				)
			).status
		).toBe(303);
		await contract!.reload();
		expect(contract!.endsOn).toBe('2026-09-30');
	});

	it('changes a role only within what the organisation allows, and switching someone off signs them out', async () => {
		const driver = await db.User.findOne({ where: { email: 'odhran.vell@larkspur.test' } });
		const session = new Client(baseUrl);
		expect((await session.signIn(driver!.email)).status).toBe(303);
		expect((await session.request('/driver')).status).toBe(200);

		const wrong = await admin.request(
			'/admin?/changePerson',
			form({ userId: String(driver!.id), role: 'workshop', active: 'on' })
		);
		expect(wrong.status).toBe(400);
		expect(await wrong.text()).toContain('That role does not fit');

		expect(
			(
				await admin.request(
					'/admin?/changePerson',
					form({ userId: String(driver!.id), role: 'driver' })
				)
			).status
		).toBe(303);
		const after = await session.request('/driver');
		expect(after.status).toBe(303);
		expect(after.headers.get('location')).toMatch(/^\/login/);
		expect((await new Client(baseUrl).signIn(driver!.email)).status).toBe(400);
	});

	it('will not let an administrator lock themselves out', async () => {
		const me = await db.User.findOne({ where: { email: DEMO_ACCOUNTS.admin.email } });
		const res = await admin.request(
			'/admin?/changePerson',
			form({ userId: String(me!.id), role: 'admin' })
		);
		expect(res.status).toBe(400);
		expect(await res.text()).toContain('You cannot remove your own administrator access');
	});
});
