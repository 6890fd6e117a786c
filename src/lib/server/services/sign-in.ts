import { Op } from 'sequelize';
import { config } from '../config';
import { SignInAttempt, User } from '../db';
import { decoyPasswordHash, verifyPassword } from '../auth/password';
import { TooManyAttemptsError } from './errors';

export interface SignInInput {
	email: string;
	password: string;
	address: string;
}

const windowStart = (now: Date) => new Date(now.getTime() - config.SIGNIN_LOCK_MINUTES * 60_000);

/**
 * Checks a password with throttling per account and per network address. Failures are kept in
 * the database so the limit holds across app instances. Returns the user id, or null for one
 * neutral "wrong e-mail or password" answer.
 */
export async function checkCredentials(
	input: SignInInput,
	now = new Date()
): Promise<number | null> {
	const accountKey = input.email.trim().toLowerCase();
	const since = windowStart(now);
	const [accountFailures, addressFailures] = await Promise.all([
		SignInAttempt.count({ where: { accountKey, attemptedAt: { [Op.gte]: since } } }),
		SignInAttempt.count({ where: { addressKey: input.address, attemptedAt: { [Op.gte]: since } } })
	]);
	if (
		accountFailures >= config.SIGNIN_MAX_FAILURES ||
		addressFailures >= config.SIGNIN_MAX_FAILURES_PER_ADDRESS
	) {
		throw new TooManyAttemptsError(config.SIGNIN_LOCK_MINUTES * 60);
	}

	const user = await User.findOne({ where: { email: accountKey, active: true } });
	const ok = user?.passwordHash
		? await verifyPassword(user.passwordHash, input.password)
		: (await verifyPassword(await decoyPasswordHash(), input.password), false);

	if (!ok || !user) {
		await SignInAttempt.create({ accountKey, addressKey: input.address, attemptedAt: now });
		return null;
	}
	// A success ends the run of failures for this account.
	await SignInAttempt.destroy({ where: { accountKey } });
	return user.id;
}
