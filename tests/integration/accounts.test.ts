import { beforeAll, describe, expect, inject, it } from 'vitest';
import { Client } from './http';
import { firstLink, waitForMail } from './mail';
import { DEMO_ACCOUNTS } from '../../src/lib/server/demo/scenario';

const baseUrl = inject('baseUrl');
const mailDir = inject('mailDir');
let admin: Client;
let fleet: Client;

const form = (fields: Record<string, string>): RequestInit => ({
	method: 'POST',
	headers: { 'content-type': 'application/x-www-form-urlencoded', accept: 'text/html' },
	body: new URLSearchParams(fields)
});

beforeAll(async () => {
	admin = new Client(baseUrl);
	await admin.signIn(DEMO_ACCOUNTS.admin.email);
	fleet = new Client(baseUrl);
	await fleet.signIn(DEMO_ACCOUNTS.fleetManager.email);
});

describe('invitations', () => {
	it('an admin invites a workshop user, who sets a password through the e-mailed link and signs in', async () => {
		process.env.DATABASE_URL = inject('databaseUrl');
		const { Organisation, getDb } = await import('../../src/lib/server/db');
		getDb();
		const fenwright = await Organisation.findOne({ where: { name: 'Fenwright Diesel Clinic' } });
		const email = 'new.technician@fenwright.test';
		const res = await admin.request(
			'/admin/people?/invite',
			form({ name: 'Noor Achebe', email, role: 'workshop', organisationId: String(fenwright!.id) })
		);
		expect(res.status).toBe(303);

		const mail = await waitForMail(mailDir, email, /invited you to Sootcast/);
		expect(mail.html).toContain('Choose your password');
		const link = firstLink(mail.text ?? '', '/welcome/');
		const path = new URL(link).pathname;

		const visitor = new Client(baseUrl);
		expect(await (await visitor.request(path)).text()).toContain('Noor Achebe');
		const set = await visitor.request(
			path,
			form({ password: 'a-long-new-password', confirm: 'a-long-new-password' })
		);
		expect(set.status).toBe(303);
		expect(set.headers.get('location')).toBe('/login?password=set');

		const signIn = await new Client(baseUrl).signIn(email, 'a-long-new-password');
		expect(signIn.headers.get('location')).toBe('/workshop');

		// Single use: the same link now shows the neutral dead-link message.
		const again = await new Client(baseUrl).request(path);
		expect(await again.text()).toContain('This link is not valid any more');
	});

	it('a fleet manager may invite drivers to their own fleet but not workshop users', async () => {
		const refused = await fleet.request(
			'/fleet/people?/invite',
			form({ name: 'Ola Witt', email: 'ola.witt@larkspur.test', role: 'workshop' })
		);
		expect(refused.status).toBe(400);
		expect(await refused.text()).toContain(
			'A fleet manager can invite drivers and other fleet managers.'
		);
		const ok = await fleet.request(
			'/fleet/people?/invite',
			form({ name: 'Ola Witt', email: 'ola.witt@larkspur.test', role: 'driver' })
		);
		expect(ok.status).toBe(303);
		await waitForMail(mailDir, 'ola.witt@larkspur.test', /invited you/);
	});

	it('refuses an invitation for an e-mail that already has an account, with a field message', async () => {
		const res = await fleet.request(
			'/fleet/people?/invite',
			form({ name: 'Dup', email: DEMO_ACCOUNTS.driver.email, role: 'driver' })
		);
		expect(res.status).toBe(400);
		expect(await res.text()).toContain('Someone with that e-mail already has an account');
	});

	it('shows the same neutral page for an unknown link', async () => {
		const res = await new Client(baseUrl).request('/welcome/not-a-real-token');
		expect(res.status).toBe(200);
		expect(await res.text()).toContain('This link is not valid any more');
	});

	it('shows the neutral page for an expired invitation link', async () => {
		const { issueActionToken } = await import('../../src/lib/server/services/account-links');
		const { User } = await import('../../src/lib/server/db');
		const someone = await User.findOne({ where: { email: DEMO_ACCOUNTS.otherWorkshop.email } });
		const longAgo = new Date(Date.now() - 5 * 24 * 3_600_000);
		const token = await issueActionToken(someone!.id, 'invite', longAgo);
		const res = await new Client(baseUrl).request(`/welcome/${token}`);
		expect(await res.text()).toContain('This link is not valid any more');
		const post = await new Client(baseUrl).request(
			`/welcome/${token}`,
			form({ password: 'another-password-1', confirm: 'another-password-1' })
		);
		expect(post.status).toBe(400);
	});
});

// A driver no other test signs in as, so changing the password disturbs nothing else.
const RESET_EMAIL = 'caspian.moyo@larkspur.test';

describe('password reset', () => {
	it('answers the same for unknown and known addresses, and the known one gets a working link', async () => {
		const unknown = await new Client(baseUrl).request(
			'/forgot',
			form({ email: 'nobody@nowhere.test' })
		);
		const known = await new Client(baseUrl).request('/forgot', form({ email: RESET_EMAIL }));
		expect(unknown.headers.get('location')).toBe('/forgot?sent');
		expect(known.headers.get('location')).toBe('/forgot?sent');

		const mail = await waitForMail(mailDir, RESET_EMAIL, /Reset your Sootcast password/);
		const path = new URL(firstLink(mail.text ?? '', '/reset/')).pathname;
		const mismatch = await new Client(baseUrl).request(
			path,
			form({ password: 'brand-new-password', confirm: 'something-else' })
		);
		expect(await mismatch.text()).toContain('The two passwords are not the same');
		const ok = await new Client(baseUrl).request(
			path,
			form({ password: 'brand-new-password', confirm: 'brand-new-password' })
		);
		expect(ok.status).toBe(303);
		expect((await new Client(baseUrl).signIn(RESET_EMAIL, 'brand-new-password')).status).toBe(303);
		expect((await new Client(baseUrl).signIn(RESET_EMAIL)).status).toBe(400);
	});
});
