import os from 'node:os';
import { randomUUID } from 'node:crypto';
import { JobRun } from '../db';
import { acquireLease, extendLease, releaseLease } from './job-lease';

export type JobSummary = Record<string, number | string>;
export type JobOutcome =
	{ skipped: true; reason: string } | { skipped: false; runId: number; summary: JobSummary };

const HOLDER = `${os.hostname()}:${process.pid}:${randomUUID().slice(0, 8)}`;
/** How long a finished occurrence is remembered, so a late worker cannot run it again. */
const OCCURRENCE_MEMORY_MS = 2 * 86_400_000;

/** `forecast@20261202020000`: the lease key of one scheduled occurrence of a job (UTC). */
export function occurrenceKey(job: string, slot: Date): string {
	return `${job}@${slot.toISOString().replace(/[-:T]/g, '').slice(0, 14)}`;
}

/**
 * Runs a job under a database lease, so two processes (or two instances) never do the same
 * work at once, and records the run with its summary for the admin page.
 *
 * With a `slot` (the time the schedule fired for, the same on every worker), the occurrence is
 * also claimed and remembered: when several workers fire for 02:00, one runs and the rest skip,
 * even those that arrive after it has finished. A holder that dies loses both leases when they
 * expire.
 */
export async function runUnderLease(
	job: string,
	work: (ctx: { now: Date; runId: number }) => Promise<JobSummary>,
	options: { now?: Date; leaseMs?: number; slot?: Date } = {}
): Promise<JobOutcome> {
	const now = options.now ?? new Date();
	const leaseMs = options.leaseMs ?? 30 * 60_000;
	const occurrence = options.slot ? occurrenceKey(job, options.slot) : null;
	if (occurrence && !(await acquireLease(occurrence, HOLDER, leaseMs, new Date()))) {
		return { skipped: true, reason: 'this occurrence ran on another worker' };
	}
	if (!(await acquireLease(job, HOLDER, leaseMs, new Date()))) {
		if (occurrence) await releaseLease(occurrence, HOLDER);
		return { skipped: true, reason: 'another run holds the lease' };
	}
	const run = await JobRun.create({ job, startedAt: new Date() });
	try {
		const summary = await work({ now, runId: run.id });
		await run.update({ state: 'done', finishedAt: new Date(), summary });
		if (occurrence)
			await extendLease(occurrence, HOLDER, new Date(Date.now() + OCCURRENCE_MEMORY_MS));
		return { skipped: false, runId: run.id, summary };
	} catch (err) {
		await run.update({
			state: 'failed',
			finishedAt: new Date(),
			summary: { error: err instanceof Error ? err.message : String(err) }
		});
		// A failed occurrence may be tried again (by hand or by a worker still in its minute).
		if (occurrence) await releaseLease(occurrence, HOLDER);
		throw err;
	} finally {
		await releaseLease(job, HOLDER);
	}
}
