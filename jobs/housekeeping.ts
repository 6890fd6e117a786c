import { removeExpiredSignInState } from '../src/lib/server/services/housekeeping';
import type { Job } from './types';

/** Hourly: drop expired sessions, sign-in failures older than the throttling window and run-out job leases. */
export const housekeeping: Job = {
	name: 'housekeeping',
	schedule: process.env.JOB_HOUSEKEEPING_CRON ?? '17 * * * *',
	recorded: true,
	run: ({ now }) => removeExpiredSignInState(now)
};
