import cron from 'node-cron';
import { closeDb, getDb, migrate } from '../src/lib/server/db';
import { runUnderLease } from '../src/lib/server/services/job-runner';
import { advice } from './advice';
import { forecast } from './forecast';
import { housekeeping } from './housekeeping';
import { outbox } from './outbox';
import type { Job } from './types';

export const JOBS: Job[] = [forecast, advice, housekeeping, outbox];

/** Runs one job now under its lease; logs start, end and summary. Returns null if skipped or failed. */
export async function runJob(job: Job, now = new Date(), slot?: Date) {
	const started = Date.now();
	try {
		const outcome = await runUnderLease(
			job.name,
			async ({ runId }) => job.run({ now, runId: job.recorded ? runId : null }),
			{ now, slot }
		);
		if (outcome.skipped) {
			console.log(`[jobs] ${job.name}: skipped (${outcome.reason})`);
			return null;
		}
		const quiet = !job.recorded && Object.values(outcome.summary).every((v) => v === 0);
		if (!quiet)
			console.log(
				`[jobs] ${job.name}: done in ${Date.now() - started} ms ${JSON.stringify(outcome.summary)}`
			);
		return outcome.summary;
	} catch (err) {
		console.error(`[jobs] ${job.name}: failed`, err);
		return null;
	}
}

/**
 * Registers every job (or only those named) once; returns a function that stops the schedule
 * and resolves when the runs in progress have finished, so a stopped worker leaves no half run.
 */
export function startWorker(
	timezone = process.env.JOBS_TZ ?? 'Europe/London',
	only: string[] = []
): () => Promise<void> {
	getDb();
	const jobs = only.length ? JOBS.filter((j) => only.includes(j.name)) : JOBS;
	const inFlight = new Set<Promise<unknown>>();
	const tasks = jobs.map((job) =>
		// ctx.date is the time the schedule fired for, identical on every worker: the occurrence.
		cron.schedule(
			job.schedule,
			(ctx) => {
				const run = runJob(job, new Date(), ctx.date);
				inFlight.add(run);
				void run.finally(() => inFlight.delete(run));
			},
			{
				timezone,
				name: job.name,
				noOverlap: true,
				// Instances firing together may start up to this much apart, easing the database.
				maxRandomDelay: Number(process.env.JOBS_MAX_DELAY_MS ?? 0)
			}
		)
	);
	console.log(
		`[jobs] scheduled: ${jobs.map((j) => `${j.name} (${j.schedule})`).join(', ')} in ${timezone}`
	);
	return async () => {
		await Promise.all(tasks.map((t) => t.stop()));
		await Promise.allSettled([...inFlight]);
	};
}

// Run alone: `tsx jobs/index.ts` keeps the worker going; `tsx jobs/index.ts NAME --once` (or
// `--once NAME`, e.g. `npm run job:forecast -- --once`) runs one job now and exits.
if (import.meta.url === `file://${process.argv[1]}`) {
	await migrate();
	const args = process.argv.slice(2);
	if (args.includes('--once')) {
		const name = args.find((a) => a !== '--once') ?? '';
		const job = JOBS.find((j) => j.name === name);
		if (!job) {
			console.error(`Unknown job "${name}". Jobs: ${JOBS.map((j) => j.name).join(', ')}`);
			process.exit(2);
		}
		const summary = await runJob(job);
		await closeDb();
		process.exit(summary ? 0 : 1);
	}
	const stop = startWorker(undefined, args);
	const shutdown = async () => {
		console.log('[jobs] stopping after the runs in progress');
		await stop();
		await closeDb();
		process.exit(0);
	};
	process.once('SIGTERM', () => void shutdown());
	process.once('SIGINT', () => void shutdown());
}
