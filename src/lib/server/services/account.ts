import { User } from '../db';
import type { SessionUser } from '../auth/lucia';
import type { UnitPreferenceInput } from '../../validation/vehicle';
import { recordAudit } from './audit';

export async function getOwnSettings(user: SessionUser) {
	const row = await User.findByPk(user.id, {
		attributes: ['notifyDigest', 'notifyStatuses', 'crossingWindowDays', 'adviceOptOut']
	});
	return {
		notifyDigest: row?.notifyDigest ?? true,
		notifyStatuses: (row?.notifyStatuses ?? []) as string[],
		crossingWindowDays: row?.crossingWindowDays ?? 30,
		adviceOptOut: row?.adviceOptOut ?? false
	};
}

export async function updateOwnSettings(
	user: SessionUser,
	input: UnitPreferenceInput
): Promise<void> {
	await User.update(
		{
			name: input.name,
			unitPreference: input.unitPreference,
			notifyDigest: input.notifyDigest,
			notifyStatuses: input.notifyStatuses,
			crossingWindowDays: input.crossingWindowDays,
			// Only drivers are offered the weekly advice, so only their form carries the choice.
			...(user.role === 'driver' ? { adviceOptOut: !input.adviceEmails } : {})
		},
		{ where: { id: user.id } }
	);
	await recordAudit(user, 'user.settings', 'user', user.id, input);
}
