import { removeExpiredSignInState } from '../src/lib/server/services/housekeeping';
import type { Job } from './types';

/** Hourly: drop expired sessions and sign-in failures older than the throttling window. */
export const housekeeping: Job = {
	name: 'housekeeping',
	schedule: process.env.JOB_HOUSEKEEPING_CRON ?? '17 * * * *',
	recorded: true,
	run: ({ now }) => removeExpiredSignInState(now)
};
