import { spawn, type ChildProcess } from 'node:child_process';
import fs from 'node:fs';
import net from 'node:net';
import path from 'node:path';

export function freePort(): Promise<number> {
	return new Promise((resolve, reject) => {
		const srv = net.createServer();
		srv.listen(0, '127.0.0.1', () => {
			const { port } = srv.address() as net.AddressInfo;
			srv.close(() => resolve(port));
		});
		srv.on('error', reject);
	});
}

export async function waitForHealth(url: string, server: ChildProcess, timeoutMs = 30_000) {
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

export interface RunningServer {
	baseUrl: string;
	stop(): Promise<void>;
}

/** Starts the built server (`npm run build` first) on a free port with the given environment. */
export async function startBuiltServer(env: Record<string, string>): Promise<RunningServer> {
	const buildEntry = path.resolve('build/index.js');
	if (!fs.existsSync(buildEntry))
		throw new Error('No build found: run `npm run build` before the integration tests.');
	const port = await freePort();
	const baseUrl = `http://127.0.0.1:${port}`;
	const server = spawn(process.execPath, [buildEntry], {
		env: {
			...process.env,
			PORT: String(port),
			HOST: '127.0.0.1',
			ORIGIN: baseUrl,
			NODE_ENV: 'test',
			...env
		},
		stdio: ['ignore', 'inherit', 'inherit']
	});
	await waitForHealth(baseUrl, server);
	return {
		baseUrl,
		async stop() {
			if (server.exitCode !== null) return;
			server.kill('SIGTERM');
			await new Promise((r) => server.once('exit', r));
		}
	};
}
