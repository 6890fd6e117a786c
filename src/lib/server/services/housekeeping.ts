import { Op } from 'sequelize';
import { config } from '../config';
import { Session, SignInAttempt } from '../db';
import { removeExpiredLeases } from './job-lease';

export async function removeExpiredSignInState(now: Date) {
	const sessions = await Session.destroy({ where: { expiresAt: { [Op.lte]: now } } });
	const cutoff = new Date(now.getTime() - config.SIGNIN_LOCK_MINUTES * 60_000);
	const attempts = await SignInAttempt.destroy({ where: { attemptedAt: { [Op.lt]: cutoff } } });
	const leases = await removeExpiredLeases(now);
	return { expiredSessions: sessions, oldSignInFailures: attempts, expiredJobLeases: leases };
}
