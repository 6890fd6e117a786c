/**
 * Capture upload memory benchmark: `npm run build && npm run bench:capture-upload`.
 * Starts the built server on a free port with a temporary database (demo fleet) and storage
 * folder, signs in as the demo workshop and streams a generated 5-million-sample static-test
 * capture (about 100 MB, never held whole by this script either) to the capture API. The
 * server streams it to disk, parses it, builds the chart pyramid and judges it. The server's
 * resident memory is sampled from /proc during the upload; its peak (VmHWM) must stay bounded.
 * Ends with one JSON line.
 */
import { spawn } from 'node:child_process';
import fs from 'node:fs';
import { mkdtemp, readFile, rm } from 'node:fs/promises';
import net from 'node:net';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { Readable } from 'node:stream';
import {
	createSyntheticSignal,
	HEALTHY_SPEC,
	type SyntheticStaticTestSpec
} from '../src/lib/domain/capture/synthetic';
import { createRandom } from '../src/lib/domain/stats/random';

const SAMPLES = 5_000_000;
// 100 kHz for 50 s, as in bench/capture.ts: an oscilloscope-rate capture of one static test
const spec: SyntheticStaticTestSpec = {
	...HEALTHY_SPEC,
	sampleRateHz: 100_000,
	engineOffS: 5,
	startS: 5,
	idleS: 20,
	throttleS: 6,
	tailS: 14
};

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

/** The capture as a stream of CSV text, generated block by block as the upload pulls it. */
function captureStream(): { stream: ReadableStream<Uint8Array>; bytes: () => number } {
	const signal = createSyntheticSignal(spec);
	const random = createRandom(42);
	const encoder = new TextEncoder();
	let i = 0;
	let bytes = 0;
	const source = new Readable({
		read() {
			if (i === 0) {
				const head = encoder.encode('Time (ms),Channel A (V)\n');
				bytes += head.length;
				this.push(head);
			}
			if (i >= SAMPLES) {
				this.push(null);
				return;
			}
			let block = '';
			const end = Math.min(SAMPLES, i + 20_000);
			for (; i < end; i++) {
				const t = i / spec.sampleRateHz;
				block += `${(t * 1000).toFixed(3)},${(signal(t) + spec.noiseVolts * random.normal()).toFixed(5)}\n`;
			}
			const chunk = encoder.encode(block);
			bytes += chunk.length;
			this.push(chunk);
		}
	});
	return {
		stream: Readable.toWeb(source) as unknown as ReadableStream<Uint8Array>,
		bytes: () => bytes
	};
}

async function memoryOf(pid: number): Promise<{ rssMb: number; peakMb: number }> {
	const status = await readFile(`/proc/${pid}/status`, 'utf8');
	const kb = (name: string) => Number(new RegExp(`${name}:\\s+(\\d+)`).exec(status)?.[1] ?? NaN);
	return { rssMb: kb('VmRSS') / 1024, peakMb: kb('VmHWM') / 1024 };
}

async function main() {
	const buildEntry = path.resolve('build/index.js');
	if (!fs.existsSync(buildEntry)) throw new Error('No build found: run `npm run build` first.');
	const dir = await mkdtemp(path.join(tmpdir(), 'sootcast-bench-capture-'));
	const databaseUrl = `sqlite:${path.join(dir, 'sootcast.db')}`;
	process.env.DATABASE_URL = databaseUrl;
	const { migrate, closeDb, Vehicle } = await import('../src/lib/server/db');
	const { seedDemo } = await import('../src/lib/server/services/demo-seed');
	const { DEMO_ACCOUNTS, DEMO_PASSWORD } = await import('../src/lib/server/demo/scenario');
	await migrate();
	await seedDemo(new Date(), 14);
	const vanId = (await Vehicle.findOne({ where: { registration: 'LKD 401' } }))!.id;
	await closeDb();

	const port = await freePort();
	const baseUrl = `http://127.0.0.1:${port}`;
	const server = spawn(process.execPath, [buildEntry], {
		env: {
			...process.env,
			PORT: String(port),
			HOST: '127.0.0.1',
			ORIGIN: baseUrl,
			DATABASE_URL: databaseUrl,
			STORAGE_DIR: path.join(dir, 'uploads'),
			BODY_SIZE_LIMIT: String(300 * 1024 * 1024),
			APP_SECRET: 'capture-upload-bench-secret-0123456789abcdef',
			NODE_ENV: 'production'
		},
		stdio: ['ignore', 'ignore', 'inherit']
	});
	try {
		for (let tries = 0; ; tries++) {
			try {
				if ((await fetch(`${baseUrl}/api/health`)).ok) break;
			} catch {
				// not listening yet
			}
			if (tries > 200) throw new Error('The server did not start.');
			await new Promise((r) => setTimeout(r, 150));
		}
		const login = await fetch(`${baseUrl}/login`, {
			method: 'POST',
			headers: {
				'content-type': 'application/x-www-form-urlencoded',
				origin: baseUrl,
				accept: 'text/html'
			},
			body: new URLSearchParams({ email: DEMO_ACCOUNTS.workshop.email, password: DEMO_PASSWORD }),
			redirect: 'manual'
		});
		const cookie = (login.headers.get('set-cookie') ?? '').split(';')[0];
		if (!cookie) throw new Error(`Sign-in failed (${login.status}).`);
		// Warm the server (first request migrates and loads modules) before measuring
		await fetch(`${baseUrl}/api/v1/vehicles/${vanId}`, { headers: { cookie } });
		const before = await memoryOf(server.pid!);

		let peakSeenMb = before.rssMb;
		const sampler = setInterval(async () => {
			try {
				peakSeenMb = Math.max(peakSeenMb, (await memoryOf(server.pid!)).rssMb);
			} catch {
				// the server is gone
			}
		}, 100);
		const body = captureStream();
		const start = process.hrtime.bigint();
		const res = await fetch(`${baseUrl}/api/v1/vehicles/${vanId}/captures?fileName=bench-5M.csv`, {
			method: 'POST',
			headers: { cookie, 'content-type': 'text/csv' },
			body: body.stream,
			duplex: 'half'
		} as RequestInit);
		const answer = (await res.json()) as {
			testId?: number;
			verdict?: string;
			error?: { message: string };
		};
		const seconds = Number(process.hrtime.bigint() - start) / 1e9;
		clearInterval(sampler);
		if (res.status !== 201)
			throw new Error(`Upload failed (${res.status}): ${answer.error?.message}`);
		const after = await memoryOf(server.pid!);
		const mb = body.bytes() / 1e6;
		console.log(
			`uploaded ${SAMPLES.toLocaleString('en')} samples (${mb.toFixed(0)} MB) in ${seconds.toFixed(1)} s, verdict ${answer.verdict}`
		);
		console.log(
			`server RSS: ${before.rssMb.toFixed(0)} MB before, peak ${after.peakMb.toFixed(0)} MB (sampled ${peakSeenMb.toFixed(0)} MB), ${after.rssMb.toFixed(0)} MB after`
		);
		console.log(
			JSON.stringify({
				bench: 'capture-upload',
				samples: SAMPLES,
				bytes: body.bytes(),
				seconds: Number(seconds.toFixed(2)),
				mb_per_s: Number((mb / seconds).toFixed(1)),
				server_rss_before_mb: Number(before.rssMb.toFixed(1)),
				server_peak_rss_mb: Number(after.peakMb.toFixed(1)),
				verdict: answer.verdict
			})
		);
	} finally {
		server.kill('SIGTERM');
		await new Promise((r) => server.once('exit', r));
		await rm(dir, { recursive: true, force: true });
	}
}

await main();
