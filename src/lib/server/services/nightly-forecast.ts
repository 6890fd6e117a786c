import { forecastAllVehicles } from './forecasts';
import { queueDigests } from './digests';
import { deliverDueMail } from './outbox';

/** The nightly run: every van through the engine, then one digest per recipient, then send. */
export async function runNightlyForecast(now: Date, runId: number | null) {
	const started = Date.now();
	const result = await forecastAllVehicles(now, runId);
	const queued = await queueDigests(
		result.changes,
		now,
		runId === null ? `day-${now.toISOString().slice(0, 10)}` : `run-${runId}`
	);
	const delivery = await deliverDueMail(now);
	return {
		vans: result.vans,
		forecast: result.forecast,
		failed: result.failures.length,
		statusChanges: result.changes.length,
		messagesQueued: queued,
		messagesSent: delivery.sent,
		seconds: Math.round((Date.now() - started) / 100) / 10,
		...(result.failures.length
			? { failedVans: result.failures.map((f) => f.registration).join(', ') }
			: {})
	};
}
