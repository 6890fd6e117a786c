import { spawn } from 'node:child_process';
import { Op } from 'sequelize';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { factories } from './factories';
import { createTestDatabase } from './test-database';

// Several instances on one database: they migrate in turn and a scheduled job runs once per
// occurrence however many workers fire for it. Real processes, as deployed (tsx entry points).
const database = await createTestDatabase('instances');
process.env.DATABASE_URL = database.url;
const db = await import('../../src/lib/server/db');
const make = factories(db);
const tsx = path.resolve('node_modules/.bin/tsx');

interface Finished {
	code: number | null;
	output: string;
}

function start(args: string[], env: Record<string, string> = {}) {
	const child = spawn(tsx, args, {
		env: { ...process.env, DATABASE_URL: database.url, NODE_ENV: 'test', ...env },
		stdio: ['ignore', 'pipe', 'pipe']
	});
	let output = '';
	child.stdout.on('data', (d) => (output += d));
	child.stderr.on('data', (d) => (output += d));
	const finished = new Promise<Finished>((resolve) =>
		child.once('exit', (code) => resolve({ code, output }))
	);
	return { child, finished, output: () => output };
}

afterAll(async () => {
	await db.closeDb();
	await database.drop();
});

describe(`several instances on one ${database.kind} database`, () => {
	it('migrate a fresh database together, each migration applied exactly once', async () => {
		const runs = [0, 1, 2].map(() => start(['src/lib/server/cli/migrate.ts']));
		const results = await Promise.all(runs.map((r) => r.finished));
		for (const r of results) expect(r.code, r.output).toBe(0);
		// Exactly one of them did the work; the others found the database up to date.
		expect(results.filter((r) => r.output.includes('Applied migrations')).length).toBe(1);
		const [rows] = await db.getDb().query('SELECT name FROM schema_migrations');
		const names = (rows as { name: string }[]).map((r) => r.name);
		expect(names.length).toBeGreaterThan(0);
		expect(new Set(names).size).toBe(names.length);
	});

	it("take over a dead worker's job once its lease runs out, and not before", async () => {
		const { acquireLease } = await import('../../src/lib/server/services/job-lease');
		const { runUnderLease, occurrenceKey } =
			await import('../../src/lib/server/services/job-runner');
		await db.migrate(); // a no-op after the test above; needed when this one runs alone
		const slot = new Date(Date.UTC(2026, 11, 2, 2, 0));
		// A worker claimed the 02:00 occurrence and the job, then died (nothing released).
		expect(await acquireLease(occurrenceKey('advice', slot), 'dead-worker', 1_500)).toBe(true);
		expect(await acquireLease('advice', 'dead-worker', 1_500)).toBe(true);
		const work = async () => ({ ran: 1 });
		expect(await runUnderLease('advice', work, { slot })).toMatchObject({ skipped: true });
		expect(await runUnderLease('advice', work)).toMatchObject({ skipped: true });
		await new Promise((r) => setTimeout(r, 1_600));
		expect(await runUnderLease('advice', work, { slot })).toMatchObject({
			skipped: false,
			summary: { ran: 1 }
		});
		// Done now, the occurrence stays claimed: a late worker does not run it again.
		expect(await runUnderLease('advice', work, { slot })).toMatchObject({ skipped: true });
	});

	describe('two job workers started together', () => {
		let vans = 0;
		beforeAll(async () => {
			const fleet = await make.organisation('Brackenridge Parcels', 'fleet');
			const day = 86_400_000;
			for (const reg of ['BRP 11', 'BRP 12', 'BRP 13']) {
				const van = await make.van(fleet.id, reg);
				await make.readings(van.id, new Date(Date.now() - day), 10, 3, (i) => 140 + 4 * i);
				vans += 1;
			}
		});

		it('run each occurrence of the forecast job once', async () => {
			// Every 3 seconds instead of nightly, so several occurrences pass during the test; each
			// worker starts up to 1.5 s late, so one may arrive after the other has finished.
			const env = {
				JOB_FORECAST_CRON: '*/3 * * * * *',
				JOBS_TZ: 'UTC',
				JOBS_MAX_DELAY_MS: '1500',
				SMTP_URL: 'smtp://127.0.0.1:9'
			};
			const workers = [
				start(['jobs/index.ts', 'forecast'], env),
				start(['jobs/index.ts', 'forecast'], env)
			];
			const until = Date.now() + 40_000;
			while (
				Date.now() < until &&
				(await db.JobRun.count({ where: { job: 'forecast', state: 'done' } })) < 3
			)
				await new Promise((r) => setTimeout(r, 250));
			for (const w of workers) w.child.kill('SIGTERM');
			const outputs = (await Promise.all(workers.map((w) => w.finished))).map((f) => f.output);

			const runs = await db.JobRun.findAll({
				where: { job: 'forecast' },
				order: [['startedAt', 'ASC']]
			});
			expect(runs.length, outputs.join('\n')).toBeGreaterThanOrEqual(3);
			expect(runs.every((r) => r.state !== 'failed')).toBe(true);
			// One run per occurrence: every run claimed its own occurrence (job_leases keeps one
			// row per claimed occurrence, e.g. forecast@20261202020003), none ran one twice.
			const claimed = await db.JobLease.count({ where: { job: { [Op.like]: 'forecast@%' } } });
			expect(claimed).toBe(runs.length);
			// Both workers took part: each ran or skipped occurrences (a worker still busy with the
			// last occurrence, or still starting, may miss one altogether, so no exact count).
			for (const out of outputs) expect(out, out).toMatch(/forecast: (done|skipped)/);
			expect(outputs.join('')).toMatch(
				/forecast: skipped \(this occurrence ran on another worker\)/
			);
			const done = outputs.join('').match(/forecast: done/g)?.length ?? 0;
			expect(done).toBe(runs.filter((r) => r.state === 'done').length);
			// Each finished run forecast each van once.
			expect(await db.Forecast.count()).toBe(vans * done);
		});
	});
});
