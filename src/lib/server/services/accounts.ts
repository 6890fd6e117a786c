import { lucia } from '../auth/lucia';
import type { SessionUser } from '../auth/lucia';
import { hashPassword } from '../auth/password';
import { publicUrl } from '../config';
import { Organisation, User, getDb } from '../db';
import { buttonHtml, escapeHtml, frameHtml } from '../mail/html';
import type { InviteInput } from '../../validation/account';
import type { Role } from '../../domain/vocabulary';
import { LINK_LIFETIME_HOURS, consumeActionToken, issueActionToken } from './account-links';
import { ForbiddenError, NotFoundError, ValidationError } from './errors';
import { kickOutbox, queueMail } from './outbox';
import { recordAudit } from './audit';

const ROLE_WORDS: Record<Role, string> = {
	admin: 'an administrator',
	fleet_manager: 'a fleet manager',
	workshop: 'a workshop technician',
	driver: 'a driver'
};

/** Which roles an inviter may give, and into which organisation. */
function inviteTarget(actor: SessionUser, input: InviteInput): { organisationId: number } {
	if (actor.role === 'admin') {
		if (!input.organisationId)
			throw new ValidationError('Choose an organisation', {
				organisationId: 'Choose an organisation'
			});
		return { organisationId: input.organisationId };
	}
	if (actor.role === 'fleet_manager') {
		if (input.role !== 'driver' && input.role !== 'fleet_manager') {
			throw new ForbiddenError('A fleet manager can invite drivers and other fleet managers.');
		}
		return { organisationId: actor.organisationId };
	}
	throw new ForbiddenError('Only administrators and fleet managers can invite people.');
}

const ROLES_BY_KIND: Record<string, Role[]> = {
	fleet: ['fleet_manager', 'driver'],
	workshop: ['workshop'],
	platform: ['admin']
};

/** Creates the account without a password and e-mails a single-use link to set one. */
export async function invitePerson(actor: SessionUser, input: InviteInput, now = new Date()) {
	const { organisationId } = inviteTarget(actor, input);
	const invited = await getDb().transaction(async () => {
		const organisation = await Organisation.findByPk(organisationId);
		if (!organisation) throw new NotFoundError('That organisation');
		if (!ROLES_BY_KIND[organisation.kind]?.includes(input.role)) {
			throw new ValidationError(`${organisation.name} cannot have ${ROLE_WORDS[input.role]}.`, {
				role: `Choose a role that fits ${organisation.name}`
			});
		}
		if (await User.findOne({ where: { email: input.email } })) {
			throw new ValidationError('Someone with that e-mail already has an account.', {
				email: 'Someone with that e-mail already has an account'
			});
		}
		const user = await User.create({
			organisationId,
			email: input.email,
			name: input.name,
			role: input.role,
			notifyStatuses: ['over_line', 'crossing_soon']
		});
		const token = await issueActionToken(user.id, 'invite', now);
		const link = `${publicUrl()}/welcome/${token}`;
		const title = `You are invited to Sootcast`;
		await queueMail(
			{
				recipient: user.email,
				subject: `${actor.name} invited you to Sootcast`,
				text: `Hello ${user.name},\n\n${actor.name} has invited you to Sootcast as ${ROLE_WORDS[input.role]} for ${organisation.name}.\n\nChoose your password here (the link works once and for ${LINK_LIFETIME_HOURS.invite} hours):\n${link}\n\nIf you were not expecting this, you can ignore this message.\n`,
				html: frameHtml(
					title,
					`<p>Hello ${escapeHtml(user.name)},</p><p>${escapeHtml(actor.name)} has invited you to Sootcast as ${ROLE_WORDS[input.role]} for ${escapeHtml(organisation.name)}.</p>${buttonHtml(link, 'Choose your password')}<p style="font-size:14px;color:#4b5659">The link works once and for ${LINK_LIFETIME_HOURS.invite} hours. If you were not expecting this, you can ignore this message.</p>`
				),
				dedupeKey: `invite:${user.id}:${now.getTime()}`
			},
			now
		);
		await recordAudit(actor, 'user.invite', 'user', user.id, {
			email: user.email,
			role: user.role,
			organisationId
		});
		return { id: user.id, email: user.email };
	});
	kickOutbox();
	return invited;
}

/** Sets the password from an invitation or reset link, ends old sessions, and returns the user id. */
export async function setPasswordWithLink(
	token: string,
	purpose: 'invite' | 'reset',
	password: string,
	now = new Date()
) {
	const passwordHash = await hashPassword(password);
	const userId = await getDb().transaction(async () => {
		const id = await consumeActionToken(token, purpose, now);
		await User.update({ passwordHash }, { where: { id } });
		return id;
	});
	await lucia.invalidateUserSessions(userId);
	await recordAudit(
		null,
		purpose === 'invite' ? 'user.accept_invite' : 'user.reset_password',
		'user',
		userId,
		null,
		now
	);
	return userId;
}

/**
 * Sends a reset link if the address belongs to an active account. The caller shows the same
 * answer either way, so the form does not reveal who has an account.
 */
export async function requestPasswordReset(email: string, now = new Date()): Promise<void> {
	const user = await User.findOne({ where: { email, active: true } });
	if (!user) return;
	const token = await issueActionToken(user.id, 'reset', now);
	const link = `${publicUrl()}/reset/${token}`;
	await queueMail(
		{
			recipient: user.email,
			subject: 'Reset your Sootcast password',
			text: `Hello ${user.name},\n\nSomeone (hopefully you) asked to reset your Sootcast password. Choose a new one here; the link works once and for ${LINK_LIFETIME_HOURS.reset} hour:\n${link}\n\nIf it was not you, ignore this message: your password stays as it is.\n`,
			html: frameHtml(
				'Reset your password',
				`<p>Hello ${escapeHtml(user.name)},</p><p>Someone (hopefully you) asked to reset your Sootcast password.</p>${buttonHtml(link, 'Choose a new password')}<p style="font-size:14px;color:#4b5659">The link works once and for ${LINK_LIFETIME_HOURS.reset} hour. If it was not you, ignore this message: your password stays as it is.</p>`
			),
			dedupeKey: `reset:${user.id}:${now.getTime()}`
		},
		now
	);
	kickOutbox();
}
