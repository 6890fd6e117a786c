/** A scheduled job: a name, when it runs, and what it does. Business rules live in services. */
export interface Job {
	name: string;
	/** node-cron expression, evaluated in the configured time zone. */
	schedule: string;
	run(context: { now: Date }): Promise<Record<string, number | string>>;
}
