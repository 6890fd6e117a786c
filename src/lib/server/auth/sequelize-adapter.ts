import { Op } from 'sequelize';
import type { Adapter, DatabaseSession, DatabaseUser } from 'lucia';
import { Session, User } from '../db';

/** Lucia's storage port over our Sequelize models (lucia v3 has no Sequelize adapter). */
export class SequelizeSessionAdapter implements Adapter {
	async getSessionAndUser(
		sessionId: string
	): Promise<[session: DatabaseSession | null, user: DatabaseUser | null]> {
		const session = await Session.findByPk(sessionId);
		if (!session) return [null, null];
		const user = await User.findByPk(session.userId);
		if (!user || !user.active) return [null, null];
		return [toDatabaseSession(session), toDatabaseUser(user)];
	}

	async getUserSessions(userId: number): Promise<DatabaseSession[]> {
		const sessions = await Session.findAll({ where: { userId } });
		return sessions.map(toDatabaseSession);
	}

	async setSession(session: DatabaseSession): Promise<void> {
		await Session.create({ id: session.id, userId: session.userId, expiresAt: session.expiresAt });
	}

	async updateSessionExpiration(sessionId: string, expiresAt: Date): Promise<void> {
		await Session.update({ expiresAt }, { where: { id: sessionId } });
	}

	async deleteSession(sessionId: string): Promise<void> {
		await Session.destroy({ where: { id: sessionId } });
	}

	async deleteUserSessions(userId: number): Promise<void> {
		await Session.destroy({ where: { userId } });
	}

	async deleteExpiredSessions(): Promise<void> {
		await Session.destroy({ where: { expiresAt: { [Op.lte]: new Date() } } });
	}
}

function toDatabaseSession(s: Session): DatabaseSession {
	return { id: s.id, userId: s.userId, expiresAt: new Date(s.expiresAt), attributes: {} };
}

function toDatabaseUser(u: User): DatabaseUser {
	return {
		id: u.id,
		attributes: {
			email: u.email,
			name: u.name,
			role: u.role,
			organisationId: u.organisationId,
			unitPreference: u.unitPreference,
			locale: u.locale,
			timeZone: u.timeZone
		}
	};
}
