/**
 * A capture's chart trace on disk: the finest level of the min/max pyramid built while the
 * file streamed in (at most 65,536 buckets of count, mean, min and max), so the chart can ask
 * for any visible time range at any zoom without reading the capture again.
 *
 * Layout (float64, little-endian): [version, originS, bucketWidthS, bucketCount], then per
 * bucket [count, mean, min, max]. Empty buckets hold count 0.
 */
import type { MinMaxPyramid } from '../../domain/capture/pyramid';
import { readRange, writeBuffer } from '../storage';

const HEADER = 4;
const PER_BUCKET = 4;
const VERSION = 1;

export interface TraceBucket {
	startS: number;
	endS: number;
	count: number;
	mean: number;
	min: number;
	max: number;
}

export interface TraceInfo {
	originS: number;
	bucketWidthS: number;
	bucketCount: number;
}

/** Writes the pyramid's finest level under `key`. */
export async function saveTrace(key: string, pyramid: MinMaxPyramid): Promise<TraceInfo> {
	const originS = pyramid.startS;
	const widthS = pyramid.bucketWidthS;
	const endS = pyramid.endS;
	const count = Math.max(1, Math.floor((endS - originS) / widthS) + 1);
	const data = new Float64Array(HEADER + count * PER_BUCKET);
	data.set([VERSION, originS, widthS, count]);
	// Asking for more points than stored buckets returns each stored (non-empty) bucket as is
	for (const b of pyramid.query(originS, endS, count * 2 + 2)) {
		const i = Math.round((b.startS - originS) / widthS);
		if (i < 0 || i >= count) continue;
		data.set([b.count, b.mean, b.min, b.max], HEADER + i * PER_BUCKET);
	}
	await writeBuffer(key, new Uint8Array(data.buffer));
	return { originS, bucketWidthS: widthS, bucketCount: count };
}

async function readInfo(key: string): Promise<TraceInfo> {
	const head = await readRange(key, 0, HEADER * 8);
	const h = new Float64Array(head.buffer.slice(head.byteOffset, head.byteOffset + HEADER * 8));
	if (h[0] !== VERSION) throw new Error(`Unknown trace version ${h[0]} in ${key}`);
	return { originS: h[1], bucketWidthS: h[2], bucketCount: h[3] };
}

/**
 * About `points` buckets covering [fromS, toS]: stored buckets are merged in time-aligned
 * groups (min of mins, max of maxes, count-weighted mean), so peaks survive any zoom.
 */
export async function readTrace(
	key: string,
	fromS: number,
	toS: number,
	points: number
): Promise<{ info: TraceInfo; buckets: TraceBucket[] }> {
	const info = await readInfo(key);
	const first = Math.max(0, Math.floor((fromS - info.originS) / info.bucketWidthS));
	const last = Math.min(info.bucketCount - 1, Math.floor((toS - info.originS) / info.bucketWidthS));
	if (last < first) return { info, buckets: [] };
	const bytes = await readRange(
		key,
		(HEADER + first * PER_BUCKET) * 8,
		(last - first + 1) * PER_BUCKET * 8
	);
	const raw = new Float64Array(
		bytes.buffer.slice(bytes.byteOffset, bytes.byteOffset + bytes.byteLength)
	);
	const groupS = Math.max((toS - fromS) / points, info.bucketWidthS);
	const out: TraceBucket[] = [];
	let current: TraceBucket | null = null;
	let currentGroup = -1;
	for (let j = 0; j * PER_BUCKET < raw.length; j++) {
		const [count, mean, min, max] = raw.subarray(j * PER_BUCKET, j * PER_BUCKET + PER_BUCKET);
		if (!(count > 0)) continue;
		const startS = info.originS + (first + j) * info.bucketWidthS;
		const group = Math.floor((startS - fromS) / groupS);
		if (group !== currentGroup || !current) {
			if (current) out.push(current);
			current = { startS, endS: startS + info.bucketWidthS, count, mean, min, max };
			currentGroup = group;
		} else {
			const total = current.count + count;
			current.mean += ((mean - current.mean) * count) / total;
			current.count = total;
			if (min < current.min) current.min = min;
			if (max > current.max) current.max = max;
			current.endS = startS + info.bucketWidthS;
		}
	}
	if (current) out.push(current);
	return { info, buckets: out };
}
