import { DEMO_PASSWORD } from '../../src/lib/server/demo/scenario';

/** A signed-in (or anonymous) client of the running server that keeps its session cookie. */
export class Client {
	private cookie = '';
	constructor(readonly baseUrl: string) {}

	async request(pathname: string, init: RequestInit = {}): Promise<Response> {
		const headers = new Headers(init.headers);
		if (this.cookie) headers.set('cookie', this.cookie);
		headers.set('origin', this.baseUrl);
		const res = await fetch(this.baseUrl + pathname, { ...init, headers, redirect: 'manual' });
		const setCookie = res.headers.get('set-cookie');
		if (setCookie) this.cookie = setCookie.split(';')[0];
		return res;
	}

	/** Carries another client's session over, as a load balancer sends a browser anywhere. */
	useSessionOf(other: Client): this {
		this.cookie = other.cookie;
		return this;
	}

	/** Posts the sign-in form as a browser would (HTML form, no JavaScript). */
	async signIn(email: string, password = DEMO_PASSWORD): Promise<Response> {
		return this.request('/login', {
			method: 'POST',
			headers: { 'content-type': 'application/x-www-form-urlencoded', accept: 'text/html' },
			body: new URLSearchParams({ email, password })
		});
	}
}
