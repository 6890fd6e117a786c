import { spawn, type ChildProcess } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import net from 'node:net';
import type { TestProject } from 'vitest/node';
import { createTestDatabase } from './test-database';

declare module 'vitest' {
	export interface ProvidedContext {
		baseUrl: string;
		databaseUrl: string;
		smtpUrl: string;
		mailDir: string;
		storageDir: string;
	}
}

function freePort(): Promise<number> {
	return new Promise((resolve, reject) => {
		const srv = net.createServer();
		srv.listen(0, '127.0.0.1', () => {
			const { port } = srv.address() as net.AddressInfo;
			srv.close(() => resolve(port));
		});
		srv.on('error', reject);
	});
}

async function waitForHealth(url: string, server: ChildProcess, timeoutMs = 30_000) {
	const until = Date.now() + timeoutMs;
	while (Date.now() < until) {
		if (server.exitCode !== null)
			throw new Error(`The server exited early (code ${server.exitCode}).`);
		try {
			const res = await fetch(`${url}/api/health`);
			if (res.ok) return;
		} catch {
			// not listening yet
		}
		await new Promise((r) => setTimeout(r, 150));
	}
	throw new Error(`The server at ${url} did not answer within ${timeoutMs} ms.`);
}

/**
 * Integration tests run against the real built server (`npm run build` first) on a free port,
 * with a temporary database holding the demo fleet: SQLite, or PostgreSQL when TEST_POSTGRES_URL
 * names a server (see test-database.ts).
 */
export default async function setup(project: TestProject) {
	const buildEntry = path.resolve('build/index.js');
	if (!fs.existsSync(buildEntry))
		throw new Error('No build found: run `npm run build` before the integration tests.');
	const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'sootcast-it-'));
	const database = await createTestDatabase('server');
	const databaseUrl = database.url;
	process.env.DATABASE_URL = databaseUrl;

	const { migrate, closeDb } = await import('../../src/lib/server/db');
	const { seedDemo } = await import('../../src/lib/server/services/demo-seed');
	await migrate();
	await seedDemo(new Date(), 120);
	await closeDb();

	const { startMailSink } = await import('../../src/lib/server/mail/sink');
	const mailDir = path.join(dir, 'mailbox');
	const storageDir = path.join(dir, 'uploads');
	const sink = await startMailSink({ port: 0, dir: mailDir });
	const smtpUrl = `smtp://127.0.0.1:${sink.port}`;

	const port = await freePort();
	const baseUrl = `http://127.0.0.1:${port}`;
	const server = spawn(process.execPath, [buildEntry], {
		env: {
			...process.env,
			PORT: String(port),
			HOST: '127.0.0.1',
			ORIGIN: baseUrl,
			DATABASE_URL: databaseUrl,
			SMTP_URL: smtpUrl,
			DEV_MAILBOX_DIR: mailDir,
			APP_SECRET: 'integration-tests-secret-0123456789abcdef',
			STORAGE_DIR: storageDir,
			BODY_SIZE_LIMIT: String(300 * 1024 * 1024),
			NODE_ENV: 'test'
		},
		stdio: ['ignore', 'inherit', 'inherit']
	});
	await waitForHealth(baseUrl, server);
	project.provide('baseUrl', baseUrl);
	project.provide('databaseUrl', databaseUrl);
	project.provide('smtpUrl', smtpUrl);
	project.provide('mailDir', mailDir);
	project.provide('storageDir', storageDir);

	return async () => {
		server.kill('SIGTERM');
		await new Promise((r) => server.once('exit', r));
		await sink.close();
		await database.drop();
		fs.rmSync(dir, { recursive: true, force: true });
	};
}
