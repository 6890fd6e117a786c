/**
 * Capture throughput benchmark: `npx tsx bench/capture.ts` (npm run bench:capture).
 * Writes a 5-million-sample static-test capture to a temp dir, then reads it twice:
 * (a) floor — split into lines only; (b) full — the capture parser, per-phase summary and
 * decimation pyramid, as an upload would. Prints samples/s, the full/floor ratio and peak RSS,
 * ending with one JSON line.
 */
import { createReadStream, createWriteStream } from 'node:fs';
import { mkdtemp, rm, stat } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { once } from 'node:events';
import { createCaptureParser } from '../src/lib/domain/capture/parser';
import { detectPhases } from '../src/lib/domain/capture/phases';
import { CaptureSummary } from '../src/lib/domain/capture/summary';
import {
	createSyntheticSignal,
	HEALTHY_SPEC,
	syntheticPhases,
	type SyntheticStaticTestSpec
} from '../src/lib/domain/capture/synthetic';
import { createRandom } from '../src/lib/domain/stats/random';
import { judgeStaticTest } from '../src/lib/domain/static-test';

const SAMPLES = 5_000_000;
const CHUNK_BYTES = 1 << 20;

// 100 kHz for 50 s: an oscilloscope-rate capture of one static test
const spec: SyntheticStaticTestSpec = {
	...HEALTHY_SPEC,
	sampleRateHz: 100_000,
	engineOffS: 5,
	startS: 5,
	idleS: 20,
	throttleS: 6,
	tailS: 14
};

async function writeCapture(path: string): Promise<void> {
	const out = createWriteStream(path, { encoding: 'utf8' });
	const signal = createSyntheticSignal(spec);
	const random = createRandom(42);
	out.write('Time (ms),Channel A (V)\n');
	const rowsPerWrite = 20_000;
	for (let i = 0; i < SAMPLES;) {
		let block = '';
		const end = Math.min(SAMPLES, i + rowsPerWrite);
		for (; i < end; i++) {
			const tS = i / spec.sampleRateHz;
			const volts = signal(tS) + spec.noiseVolts * random.normal();
			block += `${(tS * 1000).toFixed(3)},${volts.toFixed(5)}\n`;
		}
		// Respect back-pressure so the file streams to disk instead of piling up in memory
		if (!out.write(block)) await once(out, 'drain');
	}
	out.end();
	await once(out, 'finish');
}

async function readLinesOnly(path: string): Promise<number> {
	let lines = 0;
	let tail = '';
	for await (const chunk of createReadStream(path, {
		encoding: 'utf8',
		highWaterMark: CHUNK_BYTES
	})) {
		const parts = (tail + (chunk as string)).split('\n');
		tail = parts.pop() ?? '';
		lines += parts.length;
	}
	return tail.length > 0 ? lines + 1 : lines;
}

async function readFull(path: string) {
	const summary = new CaptureSummary({ phases: syntheticPhases(spec) });
	const parser = createCaptureParser({ onSample: (t, v) => summary.add(t, v) });
	for await (const chunk of createReadStream(path, {
		encoding: 'utf8',
		highWaterMark: CHUNK_BYTES
	})) {
		parser.push(chunk as string);
	}
	const info = parser.end();
	const result = summary.result();
	const detection = detectPhases(summary.pyramid?.windows(0.2) ?? []);
	const report = judgeStaticTest(result.phases, { overall: result.overall });
	return {
		info,
		report,
		detection,
		chart: summary.pyramid?.query(info.firstTimeS, info.lastTimeS, 1000) ?? []
	};
}

function seconds(fromNs: bigint): number {
	return Number(process.hrtime.bigint() - fromNs) / 1e9;
}

async function main(): Promise<void> {
	const dir = await mkdtemp(join(tmpdir(), 'sootcast-bench-'));
	try {
		const path = join(dir, 'capture.csv');
		let start = process.hrtime.bigint();
		await writeCapture(path);
		const sizeMb = (await stat(path)).size / 1e6;
		console.log(
			`wrote ${SAMPLES.toLocaleString('en')} samples (${sizeMb.toFixed(0)} MB) in ${seconds(start).toFixed(1)} s`
		);

		start = process.hrtime.bigint();
		const lines = await readLinesOnly(path);
		const floorS = seconds(start);
		const floorLinesPerS = lines / floorS;
		console.log(
			`floor: ${lines.toLocaleString('en')} lines in ${floorS.toFixed(2)} s = ${Math.round(floorLinesPerS).toLocaleString('en')} lines/s`
		);

		start = process.hrtime.bigint();
		const full = await readFull(path);
		const fullS = seconds(start);
		const samplesPerS = full.info.sampleCount / fullS;
		console.log(
			`full:  ${full.info.sampleCount.toLocaleString('en')} samples in ${fullS.toFixed(2)} s = ${Math.round(samplesPerS).toLocaleString('en')} samples/s`
		);
		console.log(
			`       verdict ${full.report.overall.level}; detected phases ${Object.keys(full.detection.phases).join(', ')}; ` +
				`${full.chart.length} chart buckets`
		);
		if (full.info.sampleCount !== SAMPLES)
			throw new Error(`parsed ${full.info.sampleCount} samples, wrote ${SAMPLES}`);

		const ratio = samplesPerS / floorLinesPerS;
		// maxRSS is reported in kilobytes
		const peakRssMb = process.resourceUsage().maxRSS / 1024;
		console.log(`ratio full/floor: ${ratio.toFixed(3)}; peak RSS ${peakRssMb.toFixed(0)} MB`);
		console.log(
			JSON.stringify({
				bench: 'capture',
				samples: full.info.sampleCount,
				samples_per_s: Math.round(samplesPerS),
				floor_lines_per_s: Math.round(floorLinesPerS),
				ratio: Number(ratio.toFixed(3)),
				peak_rss_mb: Number(peakRssMb.toFixed(1))
			})
		);
	} finally {
		await rm(dir, { recursive: true, force: true });
	}
}

await main();
