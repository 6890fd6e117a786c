import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import type { TestProject } from 'vitest/node';
import { createTestDatabase } from './test-database';
import { startBuiltServer } from './servers';

declare module 'vitest' {
	export interface ProvidedContext {
		baseUrl: string;
		databaseUrl: string;
		smtpUrl: string;
		mailDir: string;
		storageDir: string;
	}
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
	process.env.APP_SECRET ??= 'integration-tests-secret-0123456789abcdef';
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

	const server = await startBuiltServer({
		DATABASE_URL: databaseUrl,
		SMTP_URL: smtpUrl,
		DEV_MAILBOX_DIR: mailDir,
		APP_SECRET: process.env.APP_SECRET!,
		STORAGE_DIR: storageDir,
		BODY_SIZE_LIMIT: String(300 * 1024 * 1024)
	});
	const baseUrl = server.baseUrl;
	project.provide('baseUrl', baseUrl);
	project.provide('databaseUrl', databaseUrl);
	project.provide('smtpUrl', smtpUrl);
	project.provide('mailDir', mailDir);
	project.provide('storageDir', storageDir);

	return async () => {
		await server.stop();
		await sink.close();
		await database.drop();
		fs.rmSync(dir, { recursive: true, force: true });
	};
}
