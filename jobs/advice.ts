import { queueWeeklyAdvice } from '../src/lib/server/services/driver-advice';
import { deliverDueMail } from '../src/lib/server/services/outbox';
import type { Job } from './types';

/** Weekly (Monday 06:30 by default): each driver's note on their own week's driving. */
export const advice: Job = {
	name: 'advice',
	schedule: process.env.JOB_ADVICE_CRON ?? '30 6 * * 1',
	recorded: true,
	run: async ({ now }) => {
		const queued = await queueWeeklyAdvice(now);
		const delivery = await deliverDueMail(now);
		return { ...queued, messagesSent: delivery.sent };
	}
};
