import { User } from '../db';
import type { SessionUser } from '../auth/lucia';
import type { UnitPreferenceInput } from '../../validation/vehicle';
import { recordAudit } from './audit';

export async function updateOwnSettings(user: SessionUser, input: UnitPreferenceInput): Promise<void> {
	await User.update({ name: input.name, unitPreference: input.unitPreference }, { where: { id: user.id } });
	await recordAudit(user, 'user.settings', 'user', user.id, input);
}
