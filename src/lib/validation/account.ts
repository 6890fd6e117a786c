import { z } from 'zod';
import { ROLES } from '../domain/vocabulary';
import { requiredText } from './helpers';

const email = z.preprocess(
	(v) => (typeof v === 'string' ? v.trim().toLowerCase() : v),
	z
		.string({ error: 'Enter an e-mail address' })
		.min(1, 'Enter an e-mail address')
		.email('Enter a valid e-mail address')
		.max(254)
);

export const inviteSchema = z.object({
	email,
	name: requiredText(120, 'Name'),
	role: z.enum(ROLES, { error: 'Choose a role' }),
	organisationId: z.preprocess(
		(v) => (v === '' || v === undefined ? undefined : Number(v)),
		z.number().int().positive().optional()
	)
});
export type InviteInput = z.infer<typeof inviteSchema>;

export const newPasswordSchema = z
	.object({
		password: z
			.string({ error: 'Choose a password' })
			.min(10, 'Use at least 10 characters')
			.max(256, 'Use at most 256 characters'),
		confirm: z.string({ error: 'Type the password again' })
	})
	.refine((v) => v.password === v.confirm, {
		path: ['confirm'],
		message: 'The two passwords are not the same'
	});
export type NewPasswordInput = z.infer<typeof newPasswordSchema>;

export const resetRequestSchema = z.object({ email });
