import { Lucia, TimeSpan } from 'lucia';
import { isSecureCookie } from '../config';
import type { PressureUnitCode, Role } from '../../domain/vocabulary';
import { SequelizeSessionAdapter } from './sequelize-adapter';

export const lucia = new Lucia(new SequelizeSessionAdapter(), {
	sessionExpiresIn: new TimeSpan(14, 'd'),
	sessionCookie: {
		name: 'sootcast_session',
		attributes: { secure: isSecureCookie(), sameSite: 'lax' }
	},
	getUserAttributes: (attributes) => ({
		email: attributes.email,
		name: attributes.name,
		role: attributes.role,
		organisationId: attributes.organisationId,
		unitPreference: attributes.unitPreference,
		locale: attributes.locale,
		timeZone: attributes.timeZone
	})
});

/** What the app knows about the signed-in person: never the password hash. */
export interface SessionUser {
	id: number;
	email: string;
	name: string;
	role: Role;
	organisationId: number;
	unitPreference: PressureUnitCode;
	locale: string;
	timeZone: string;
}

declare module 'lucia' {
	interface Register {
		Lucia: typeof lucia;
		UserId: number;
		DatabaseUserAttributes: Omit<SessionUser, 'id'>;
	}
}
