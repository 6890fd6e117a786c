import { Op, UniqueConstraintError } from 'sequelize';
import { JobLease } from '../db';

/**
 * Takes the lease on a job for `ttlMs`, or returns false if another holder has an unexpired
 * one. Works across processes and instances because the database decides: an insert for a
 * free job, a conditional update for an expired lease.
 */
export async function acquireLease(
	job: string,
	holder: string,
	ttlMs: number,
	now = new Date()
): Promise<boolean> {
	const expiresAt = new Date(now.getTime() + ttlMs);
	try {
		await JobLease.create({ job, holder, expiresAt });
		return true;
	} catch (err) {
		if (!(err instanceof UniqueConstraintError)) throw err;
	}
	const [taken] = await JobLease.update(
		{ holder, expiresAt },
		{ where: { job, expiresAt: { [Op.lte]: now } } }
	);
	return taken === 1;
}

export async function releaseLease(job: string, holder: string): Promise<void> {
	await JobLease.destroy({ where: { job, holder } });
}

/** Keeps a lease this holder has until `expiresAt` (remembering a finished occurrence). */
export async function extendLease(job: string, holder: string, expiresAt: Date): Promise<void> {
	await JobLease.update({ expiresAt }, { where: { job, holder } });
}

/** Forgets leases that ran out (remembered occurrences included). */
export async function removeExpiredLeases(now: Date): Promise<number> {
	return JobLease.destroy({ where: { expiresAt: { [Op.lte]: now } } });
}
