import { createHash, randomBytes } from 'node:crypto';
import { Op } from 'sequelize';
import { ActionToken, User } from '../db';
import type { ActionPurpose } from '../db/models/ActionToken';
import { ValidationError } from './errors';

export const LINK_LIFETIME_HOURS: Record<ActionPurpose, number> = { invite: 72, reset: 1 };

const hashToken = (token: string) => createHash('sha256').update(token).digest('hex');

/** A new single-use token for this user and purpose; older unused ones of the same purpose die. */
export async function issueActionToken(
	userId: number,
	purpose: ActionPurpose,
	now = new Date()
): Promise<string> {
	const token = randomBytes(32).toString('base64url');
	await ActionToken.update({ usedAt: now }, { where: { userId, purpose, usedAt: null } });
	await ActionToken.create({
		userId,
		purpose,
		tokenHash: hashToken(token),
		expiresAt: new Date(now.getTime() + LINK_LIFETIME_HOURS[purpose] * 3_600_000)
	});
	return token;
}

/** The same message for unknown, used and expired links: nothing about the account leaks. */
export const DEAD_LINK_MESSAGE =
	'This link is not valid any more. Links work once and expire; ask for a new one.';

/** The user a still-valid token belongs to, without using it up (to show the form). */
export async function peekActionToken(token: string, purpose: ActionPurpose, now = new Date()) {
	const row = await ActionToken.findOne({
		where: { tokenHash: hashToken(token), purpose, usedAt: null, expiresAt: { [Op.gt]: now } }
	});
	if (!row) return null;
	const user = await User.findByPk(row.userId, { attributes: ['id', 'name', 'email', 'active'] });
	return user?.active ? { id: user.id, name: user.name, email: user.email } : null;
}

/**
 * Uses a token up and returns its user id. The conditional update makes it single-use even
 * when the same link is submitted twice at once.
 */
export async function consumeActionToken(
	token: string,
	purpose: ActionPurpose,
	now = new Date()
): Promise<number> {
	const row = await ActionToken.findOne({ where: { tokenHash: hashToken(token), purpose } });
	if (!row) throw new ValidationError(DEAD_LINK_MESSAGE);
	const [used] = await ActionToken.update(
		{ usedAt: now },
		{ where: { id: row.id, usedAt: null, expiresAt: { [Op.gt]: now } } }
	);
	if (used !== 1) throw new ValidationError(DEAD_LINK_MESSAGE);
	return row.userId;
}
