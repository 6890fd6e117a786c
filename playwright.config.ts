import { defineConfig, devices } from '@playwright/test';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';

// A fresh database for every run, started through the same launcher as `npm start`. The config
// is evaluated again in every worker, so the folder is made once and handed down in the env.
process.env.SOOTCAST_E2E_DIR ??= fs.mkdtempSync(path.join(os.tmpdir(), 'sootcast-e2e-'));
const dataDir = process.env.SOOTCAST_E2E_DIR;
const port = Number(process.env.E2E_PORT ?? 3100);
export const baseURL = `http://localhost:${port}`;

export default defineConfig({
	testDir: 'tests/e2e',
	fullyParallel: false,
	workers: 1,
	retries: 0,
	reporter: [['list']],
	timeout: 30_000,
	use: {
		baseURL,
		trace: 'retain-on-failure',
		launchOptions: {
			executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
			args: [
				'--headless',
				'--no-sandbox',
				'--disable-gpu',
				'--disable-quic',
				'--no-first-run',
				'--disable-background-networking',
				'--disable-component-update',
				'--disable-sync'
			]
		}
	},
	projects: [
		{ name: 'desktop', use: { ...devices['Desktop Chrome'] } },
		{ name: 'phone', use: { ...devices['Pixel 7'] }, grep: /@phone/ }
	],
	webServer: {
		command: 'npx tsx src/lib/server/cli/start.ts',
		url: `${baseURL}/api/health`,
		reuseExistingServer: false,
		timeout: 180_000,
		stdout: process.env.E2E_SERVER_LOG ? 'pipe' : 'ignore',
		stderr: 'pipe',
		env: {
			DATABASE_URL: `sqlite:${path.join(dataDir, 'sootcast.db')}`,
			PORT: String(port),
			ORIGIN: baseURL,
			MAIL_SINK_PORT: '0',
			MAIL_SINK_DIR: path.join(dataDir, 'mailbox'),
			APP_SECRET: 'end-to-end-tests-secret-0123456789abcdef',
			STORAGE_DIR: path.join(dataDir, 'uploads')
		}
	}
});
