import { JobRun } from '../db';
import type { SessionUser } from '../auth/lucia';
import { ForbiddenError } from './errors';

export async function listJobRuns(user: SessionUser, limit = 50) {
	if (user.role !== 'admin') throw new ForbiddenError();
	const runs = await JobRun.findAll({ order: [['startedAt', 'DESC']], limit });
	return runs.map((r) => {
		const plain = r.get({ plain: true });
		return {
			id: plain.id,
			job: plain.job,
			state: plain.state,
			startedAt: new Date(plain.startedAt).toISOString(),
			finishedAt: plain.finishedAt ? new Date(plain.finishedAt).toISOString() : null,
			summary: (plain.summary ?? {}) as Record<string, unknown>
		};
	});
}
