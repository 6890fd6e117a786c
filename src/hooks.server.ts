import { error, redirect, type Handle, type HandleServerError } from '@sveltejs/kit';
import { randomUUID } from 'node:crypto';
import { lucia } from '$lib/server/auth/lucia';
import { areaOfRoute, mayEnter } from '$lib/server/auth/guards';
import { getDb, migrate } from '$lib/server/db';
import { installProcessGuard } from '$lib/server/http/process-guard';

installProcessGuard();

// The schema is brought up to date once per process, on the first request (not while building).
let ready: Promise<unknown> | null = null;

const authenticate: Handle = async ({ event, resolve }) => {
	ready ??= (getDb(), migrate());
	await ready;
	const sessionId = event.cookies.get(lucia.sessionCookieName);
	event.locals.user = null;
	event.locals.session = null;
	if (sessionId) {
		const { session, user } = await lucia.validateSession(sessionId);
		if (session?.fresh) {
			const cookie = lucia.createSessionCookie(session.id);
			event.cookies.set(cookie.name, cookie.value, { path: '.', ...cookie.attributes });
		}
		if (!session) {
			const blank = lucia.createBlankSessionCookie();
			event.cookies.set(blank.name, blank.value, { path: '.', ...blank.attributes });
		}
		event.locals.session = session;
		event.locals.user = user;
	}
	return resolve(event);
};

/** The one access guard for whole areas, applied before any load or action runs. */
const guardAreas: Handle = async ({ event, resolve }) => {
	const area = areaOfRoute(event.route.id);
	if (area) {
		const user = event.locals.user;
		if (!user) {
			const back = event.url.pathname + event.url.search;
			redirect(303, `/login?redirectTo=${encodeURIComponent(back)}`);
		}
		if (area !== 'app' && !mayEnter(user.role, area)) {
			error(403, 'This part of Sootcast is for another role.');
		}
	}
	const response = await resolve(event);
	response.headers.set('x-content-type-options', 'nosniff');
	response.headers.set('referrer-policy', 'same-origin');
	response.headers.set('x-frame-options', 'DENY');
	return response;
};

export const handle: Handle = async ({ event, resolve }) =>
	authenticate({ event, resolve: (e) => guardAreas({ event: e, resolve }) });

export const handleError: HandleServerError = ({ error: err, status }) => {
	if (status === 404) return { message: 'Not found.' };
	const errorId = randomUUID().slice(0, 8);
	console.error(`[error ${errorId}]`, err);
	return { message: `Something went wrong on our side (reference ${errorId}).`, errorId };
};
