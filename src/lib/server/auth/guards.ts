import { error, redirect } from '@sveltejs/kit';
import { getRequestEvent } from '$app/server';
import type { Role } from '../../domain/vocabulary';
import type { SessionUser } from './lucia';
import { authenticateApiToken, type ApiUser } from '../services/api-tokens';
import { ForbiddenError, UnauthorizedError } from '../services/errors';

export type { ApiUser };

/** The signed-in areas and who may enter each. The one role policy of the app. */
export const AREA_ROLES = {
	fleet: ['fleet_manager'],
	workshop: ['workshop'],
	driver: ['driver'],
	admin: ['admin']
} as const satisfies Record<string, readonly Role[]>;
export type Area = keyof typeof AREA_ROLES;

/** Where each role lands after signing in. */
export const HOME_BY_ROLE: Record<Role, string> = {
	fleet_manager: '/fleet',
	workshop: '/workshop',
	driver: '/driver',
	admin: '/admin'
};

/** `/(app)/fleet/vans/[vehicleId]` → 'fleet'; routes outside the signed-in areas → null. */
export function areaOfRoute(routeId: string | null): Area | 'app' | null {
	if (!routeId) return null;
	const match = /^\/\(app\)(?:\/([^/]+))?/.exec(routeId);
	if (!match) return null;
	const segment = match[1];
	if (segment && segment in AREA_ROLES) return segment as Area;
	return 'app';
}

export function mayEnter(role: Role, area: Area): boolean {
	return (AREA_ROLES[area] as readonly Role[]).includes(role);
}

function signInRedirect(url: URL): never {
	const back = url.pathname + url.search;
	redirect(303, `/login?redirectTo=${encodeURIComponent(back)}`);
}

/** The signed-in user, or a redirect to sign in (pages) / 401 (API). */
export function requireUser(): SessionUser {
	const event = getRequestEvent();
	const user = event.locals.user;
	if (!user) {
		if (event.url.pathname.startsWith('/api/')) error(401, 'Sign in or send an API token.');
		signInRedirect(event.url);
	}
	return user;
}

/** The signed-in user if their role is one of `roles`; otherwise 403. */
export function requireRole(...roles: Role[]): SessionUser {
	const user = requireUser();
	if (!roles.includes(user.role)) error(403, 'Your role does not give access to this.');
	return user;
}

/**
 * The API's guard: a bearer token (`Authorization: Bearer sct_…`, acting as a fleet manager of
 * the token's fleet, rate-limited) or else the session. Throws service errors, so the route
 * answers in the API's error shape through `apiErrorFrom`: 401 without valid credentials,
 * 429 when the token's allowance is spent, 403 for a role not in `roles` (any role if empty).
 */
export async function requireApiUser(...roles: Role[]): Promise<ApiUser> {
	const event = getRequestEvent();
	const header = event.request.headers.get('authorization');
	let user: ApiUser;
	if (header) {
		const match = /^Bearer\s+(\S+)$/i.exec(header.trim());
		if (!match) throw new UnauthorizedError('Send the token as "Authorization: Bearer <token>".');
		user = await authenticateApiToken(match[1]);
	} else if (event.locals.user) {
		user = { ...event.locals.user, apiTokenId: null };
	} else {
		throw new UnauthorizedError('Sign in or send an API token ("Authorization: Bearer <token>").');
	}
	if (roles.length > 0 && !roles.includes(user.role))
		throw new ForbiddenError('Your role does not give access to this.');
	return user;
}
