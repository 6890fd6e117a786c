import { describe, expect, inject, it } from 'vitest';
import { Client } from './http';
import { DEMO_ACCOUNTS } from '../../src/lib/server/demo/scenario';

const baseUrl = inject('baseUrl');

describe('sign-in', () => {
	it('lands each demo role in its own area', async () => {
		const homes = [
			[DEMO_ACCOUNTS.fleetManager.email, '/fleet'],
			[DEMO_ACCOUNTS.workshop.email, '/workshop'],
			[DEMO_ACCOUNTS.driver.email, '/driver'],
			[DEMO_ACCOUNTS.admin.email, '/admin']
		];
		for (const [email, home] of homes) {
			const res = await new Client(baseUrl).signIn(email);
			expect(res.status).toBe(303);
			expect(res.headers.get('location')).toBe(home);
		}
	});

	it('answers an unknown e-mail and a wrong password with the same neutral message', async () => {
		const unknown = await new Client(baseUrl).signIn('nobody@larkspur.test', 'whatever-password');
		const wrong = await new Client(baseUrl).signIn(
			DEMO_ACCOUNTS.otherWorkshop.email,
			'not-the-password'
		);
		expect(unknown.status).toBe(400);
		expect(wrong.status).toBe(400);
		const message = 'That e-mail and password do not match an account.';
		expect(await unknown.text()).toContain(message);
		expect(await wrong.text()).toContain(message);
	});

	it('rejects a malformed e-mail with a field message', async () => {
		const res = await new Client(baseUrl).signIn('not-an-address', 'x');
		expect(res.status).toBe(400);
		expect(await res.text()).toContain('Enter a valid e-mail address');
	});

	it('refuses the sixth wrong password in a row with a try-again-later message, even if it is right', async () => {
		const email = DEMO_ACCOUNTS.otherFleetManager.email;
		for (let i = 1; i <= 5; i++) {
			const res = await new Client(baseUrl).signIn(email, `wrong-${i}`);
			expect(res.status, `attempt ${i}`).toBe(400);
		}
		const sixth = await new Client(baseUrl).signIn(email);
		expect(sixth.status).toBe(429);
		expect(await sixth.text()).toMatch(/try again later/i);
	});

	it('sets the session cookie httpOnly and SameSite=Lax', async () => {
		const res = await new Client(baseUrl).signIn(DEMO_ACCOUNTS.fleetManager.email);
		const cookie = res.headers.get('set-cookie') ?? '';
		expect(cookie).toMatch(/sootcast_session=/);
		expect(cookie).toMatch(/HttpOnly/i);
		expect(cookie).toMatch(/SameSite=Lax/i);
	});

	// Usual open-redirect bypass forms (OWASP "Unvalidated Redirects and Forwards Cheat Sheet";
	// the WHATWG URL Standard drops tabs and newlines and reads a backslash as a slash).
	it.each([
		'//evil.test/x',
		'/\t/evil.example',
		'/\\evil.example',
		'https://evil.example',
		'/\n/evil.example'
	])('does not follow a redirect to another site after sign-in (%j)', async (redirectTo) => {
		const client = new Client(baseUrl);
		const res = await client.request('/login', {
			method: 'POST',
			headers: { 'content-type': 'application/x-www-form-urlencoded', accept: 'text/html' },
			body: new URLSearchParams({
				email: DEMO_ACCOUNTS.fleetManager.email,
				password: 'sootcast-demo',
				redirectTo
			})
		});
		expect(res.status).toBe(303);
		expect(res.headers.get('location')).toBe('/fleet');
	});

	it('follows a path on this site after sign-in, and keeps none from a crafted link', async () => {
		const page = await new Client(baseUrl).request('/login?redirectTo=%2F%09%2Fevil.example');
		expect(await page.text()).not.toContain('evil.example');
		const client = new Client(baseUrl);
		const res = await client.request('/login', {
			method: 'POST',
			headers: { 'content-type': 'application/x-www-form-urlencoded', accept: 'text/html' },
			body: new URLSearchParams({
				email: DEMO_ACCOUNTS.fleetManager.email,
				password: 'sootcast-demo',
				redirectTo: '/fleet/imports?kind=readings'
			})
		});
		expect(res.headers.get('location')).toBe('/fleet/imports?kind=readings');
	});

	it('sends a Content-Security-Policy that lets only our own scripts run', async () => {
		const res = await new Client(baseUrl).request('/login');
		const csp = res.headers.get('content-security-policy') ?? '';
		// SvelteKit's csp option: a nonce for its inline start-up script on server-rendered pages.
		expect(csp).toMatch(/script-src 'self' 'nonce-[A-Za-z0-9+/=]+'/);
		expect(csp).toContain("object-src 'none'");
		expect(csp).toContain("frame-ancestors 'none'");
		const nonce = /'nonce-([^']+)'/.exec(csp)![1];
		expect(await res.text()).toContain(`nonce="${nonce}"`);
	});
});
