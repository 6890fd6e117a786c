import cron from 'node-cron';
import { getDb, migrate } from '../src/lib/server/db';
import { housekeeping } from './housekeeping';
import type { Job } from './types';

export const JOBS: Job[] = [housekeeping];

const running = new Set<string>();

/** Runs one job now, unless this process is already running it. */
export async function runJob(job: Job, now = new Date()) {
	if (running.has(job.name)) {
		console.log(`[jobs] ${job.name}: previous run still going, skipped`);
		return null;
	}
	running.add(job.name);
	const started = Date.now();
	console.log(`[jobs] ${job.name}: started`);
	try {
		const summary = await job.run({ now });
		console.log(`[jobs] ${job.name}: done in ${Date.now() - started} ms`, JSON.stringify(summary));
		return summary;
	} catch (err) {
		console.error(`[jobs] ${job.name}: failed`, err);
		return null;
	} finally {
		running.delete(job.name);
	}
}

/** Registers every job once; returns a function that stops them. */
export function startWorker(timezone = process.env.JOBS_TZ ?? 'Europe/London'): () => void {
	getDb();
	const tasks = JOBS.map((job) => cron.schedule(job.schedule, () => void runJob(job), { timezone, name: job.name }));
	console.log(`[jobs] scheduled: ${JOBS.map((j) => `${j.name} (${j.schedule})`).join(', ')} in ${timezone}`);
	return () => tasks.forEach((t) => t.stop());
}

// Run alone: `tsx jobs/index.ts` keeps the worker going; `--once NAME` runs one job and exits.
if (import.meta.url === `file://${process.argv[1]}`) {
	await migrate();
	const onceIndex = process.argv.indexOf('--once');
	if (onceIndex >= 0) {
		const name = process.argv[onceIndex + 1] ?? '';
		const job = JOBS.find((j) => j.name === name);
		if (!job) {
			console.error(`Unknown job "${name}". Jobs: ${JOBS.map((j) => j.name).join(', ')}`);
			process.exit(2);
		}
		const summary = await runJob(job);
		await getDb().close();
		process.exit(summary ? 0 : 1);
	}
	startWorker();
}
