import type { JobSummary } from '../src/lib/server/services/job-runner';

/** A scheduled job: a name, when it runs, and what it does. Business rules live in services. */
export interface Job {
	name: string;
	/** node-cron expression, evaluated in the configured time zone. */
	schedule: string;
	/** Whether runs are recorded in job_runs (frequent plumbing jobs are not). */
	recorded: boolean;
	run(context: { now: Date; runId: number | null }): Promise<JobSummary>;
}
