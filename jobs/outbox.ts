import { deliverDueMail } from '../src/lib/server/services/outbox';
import type { Job } from './types';

/** Every minute: send queued e-mail that is due, retrying failures with back-off. */
export const outbox: Job = {
	name: 'outbox',
	schedule: process.env.JOB_OUTBOX_CRON ?? '* * * * *',
	recorded: false,
	run: async ({ now }) => ({ ...(await deliverDueMail(now)) })
};
