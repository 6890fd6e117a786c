import { z } from 'zod';
import { ORGANISATION_KINDS, ROLES } from '../domain/vocabulary';
import { requiredText } from './helpers';

const day = (label: string) =>
	z.string({ error: `Enter ${label}` }).regex(/^\d{4}-\d{2}-\d{2}$/, `Enter ${label} as a date`);

export const newOrganisationSchema = z.object({
	name: requiredText(160, 'Name'),
	kind: z.enum(ORGANISATION_KINDS, { error: 'Choose fleet, workshop or operator' })
});
export type NewOrganisationInput = z.infer<typeof newOrganisationSchema>;

export const newContractSchema = z
	.object({
		fleetId: z.coerce.number({ error: 'Choose a fleet' }).int().positive('Choose a fleet'),
		workshopId: z.coerce.number({ error: 'Choose a workshop' }).int().positive('Choose a workshop'),
		startsOn: day('the first day'),
		endsOn: z.preprocess((v) => (v === '' ? undefined : v), day('the last day').optional())
	})
	.refine((c) => !c.endsOn || c.endsOn >= c.startsOn, {
		path: ['endsOn'],
		message: 'The last day cannot be before the first'
	});
export type NewContractInput = z.infer<typeof newContractSchema>;

export const endContractSchema = z.object({
	contractId: z.coerce.number().int().positive(),
	endsOn: day('the last day')
});
export type EndContractInput = z.infer<typeof endContractSchema>;

export const changePersonSchema = z.object({
	userId: z.coerce.number().int().positive(),
	role: z.enum(ROLES, { error: 'Choose a role' }),
	active: z.preprocess((v) => v === 'on' || v === 'true', z.boolean())
});
export type ChangePersonInput = z.infer<typeof changePersonSchema>;
