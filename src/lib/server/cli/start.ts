/**
 * `npm start`: builds if the build is missing or older than the sources, migrates, loads the
 * demo fleet into an empty database, starts the local mail sink (when no SMTP_URL is set), the
 * web server and the jobs worker, and stops them all on Ctrl-C. The web server runs as a child
 * process and is restarted (with a back-off) if it stops unexpectedly.
 */
import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { config } from '../config';
import { closeDb, migrate } from '../db';
import { seedDemo } from '../services/demo-seed';
import { startMailSink, type MailSink } from '../mail/sink';
import { configureMailTransport } from '../mail/mailer';
import { DEMO_ACCOUNTS, DEMO_PASSWORD } from '../demo/scenario';
import { JOBS, runJob, startWorker } from '../../../../jobs/index';

const root = process.cwd();
const buildEntry = path.join(root, 'build', 'index.js');

function newestMtime(target: string): number {
	if (!fs.existsSync(target)) return 0;
	const stat = fs.statSync(target);
	if (!stat.isDirectory()) return stat.mtimeMs;
	let newest = stat.mtimeMs;
	for (const entry of fs.readdirSync(target))
		newest = Math.max(newest, newestMtime(path.join(target, entry)));
	return newest;
}

function buildIfNeeded(): void {
	const built = fs.existsSync(buildEntry) ? fs.statSync(buildEntry).mtimeMs : 0;
	const sources = Math.max(
		...['src', 'static', 'svelte.config.js', 'vite.config.ts', 'package.json'].map((p) =>
			newestMtime(path.join(root, p))
		)
	);
	if (built >= sources) return;
	console.log(
		built ? 'Sources changed since the last build; rebuilding…' : 'Building Sootcast (first start)…'
	);
	const result = spawnSync('npx', ['vite', 'build'], { stdio: 'inherit', cwd: root });
	if (result.status !== 0) {
		console.error('The build failed; see the messages above.');
		process.exit(result.status ?? 1);
	}
}

buildIfNeeded();
await migrate();
let sink: MailSink | null = null;
let smtpUrl = config.SMTP_URL;
if (!smtpUrl) {
	sink = await startMailSink({
		port: config.MAIL_SINK_PORT,
		dir: path.resolve(config.MAIL_SINK_DIR)
	});
	smtpUrl = `smtp://127.0.0.1:${sink.port}`;
	console.log(`Local mail sink listening on ${smtpUrl} (messages kept in ${sink.dir}).`);
}

configureMailTransport(smtpUrl);

if (config.SEED_DEMO) {
	const summary = await seedDemo();
	if (summary.seeded) {
		console.log(
			`Loaded the demo fleet: ${summary.vans} vans, ${summary.readings} readings, ${summary.trips} trips.`
		);
		// Forecast straight away so the demo does not wait for the first night.
		await runJob(JOBS.find((j) => j.name === 'forecast')!);
	}
}

const origin = config.ORIGIN ?? `http://localhost:${config.PORT}`;
let web: ChildProcess;
let stopping = false;
let restarts = 0;
let startedAt = 0;
/** Starts the web server; if it stops unexpectedly it is started again, waiting longer each time. */
function startWeb(): void {
	startedAt = Date.now();
	web = spawn(process.execPath, [buildEntry], {
		stdio: 'inherit',
		env: {
			...process.env,
			PORT: String(config.PORT),
			HOST: config.HOST,
			ORIGIN: origin,
			SMTP_URL: smtpUrl,
			DEV_MAILBOX_DIR: sink ? sink.dir : '',
			DATABASE_URL: config.DATABASE_URL,
			// adapter-node refuses bodies above BODY_SIZE_LIMIT (512 KB by default) before the app sees
			// them; captures may be far larger, and each route enforces its own limit while streaming.
			BODY_SIZE_LIMIT: process.env.BODY_SIZE_LIMIT ?? String(config.CAPTURE_MAX_BYTES + 1024 * 1024)
		}
	});
	web.on('exit', (code, signal) => {
		if (stopping) return;
		// A server that ran a minute or more starts again at once; one that keeps failing waits
		// 1, 2, 4 … up to 30 s between tries.
		if (Date.now() - startedAt > 60_000) restarts = 0;
		const waitMs = Math.min(30_000, 1000 * 2 ** restarts);
		restarts += 1;
		console.error(
			`[start] The web server stopped unexpectedly (${signal ?? `exit code ${code}`}); restarting in ${Math.round(waitMs / 1000)} s.`
		);
		setTimeout(() => {
			if (!stopping) startWeb();
		}, waitMs).unref();
	});
}
startWeb();
const stopWorker = startWorker();

console.log(`
Sootcast is running at ${origin}

Demo sign-ins (password for all: ${DEMO_PASSWORD})
  Fleet manager  ${DEMO_ACCOUNTS.fleetManager.email}
  Workshop       ${DEMO_ACCOUNTS.workshop.email}
  Driver         ${DEMO_ACCOUNTS.driver.email}
  Administrator  ${DEMO_ACCOUNTS.admin.email}

Press Ctrl-C to stop.
`);

async function stop(code = 0) {
	if (stopping) return;
	stopping = true;
	await stopWorker();
	if (web.exitCode === null) web.kill('SIGTERM');
	await sink?.close();
	await closeDb();
	process.exit(code);
}
process.on('SIGINT', () => void stop(0));
process.on('SIGTERM', () => void stop(0));
