import { z } from 'zod';

export const signInSchema = z.object({
	email: z.preprocess(
		(v) => (typeof v === 'string' ? v.trim().toLowerCase() : v),
		z
			.string({ error: 'Enter your e-mail address' })
			.min(1, 'Enter your e-mail address')
			.email('Enter a valid e-mail address')
	),
	password: z
		.string({ error: 'Enter your password' })
		.min(1, 'Enter your password')
		.max(256, 'That password is too long'),
	redirectTo: z.string().optional()
});
export type SignInInput = z.infer<typeof signInSchema>;

export { safeRedirect } from './redirect';
