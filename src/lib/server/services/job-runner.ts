import os from 'node:os';
import { randomUUID } from 'node:crypto';
import { JobRun } from '../db';
import { acquireLease, releaseLease } from './job-lease';

export type JobSummary = Record<string, number | string>;
export type JobOutcome =
	{ skipped: true; reason: string } | { skipped: false; runId: number; summary: JobSummary };

const HOLDER = `${os.hostname()}:${process.pid}:${randomUUID().slice(0, 8)}`;

/**
 * Runs a job under a database lease, so two processes (or two instances) never do the same
 * work at once, and records the run with its summary for the admin page.
 */
export async function runUnderLease(
	job: string,
	work: (ctx: { now: Date; runId: number }) => Promise<JobSummary>,
	options: { now?: Date; leaseMs?: number } = {}
): Promise<JobOutcome> {
	const now = options.now ?? new Date();
	const leaseMs = options.leaseMs ?? 30 * 60_000;
	if (!(await acquireLease(job, HOLDER, leaseMs, new Date()))) {
		return { skipped: true, reason: 'another run holds the lease' };
	}
	const run = await JobRun.create({ job, startedAt: new Date() });
	try {
		const summary = await work({ now, runId: run.id });
		await run.update({ state: 'done', finishedAt: new Date(), summary });
		return { skipped: false, runId: run.id, summary };
	} catch (err) {
		await run.update({
			state: 'failed',
			finishedAt: new Date(),
			summary: { error: err instanceof Error ? err.message : String(err) }
		});
		throw err;
	} finally {
		await releaseLease(job, HOLDER);
	}
}
