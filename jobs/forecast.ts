import { runNightlyForecast } from '../src/lib/server/services/nightly-forecast';
import type { Job } from './types';

/** Nightly (02:00 by default): recompute every van's forecast and queue the digests. */
export const forecast: Job = {
	name: 'forecast',
	schedule: process.env.JOB_FORECAST_CRON ?? '0 2 * * *',
	recorded: true,
	run: ({ now, runId }) => runNightlyForecast(now, runId)
};
