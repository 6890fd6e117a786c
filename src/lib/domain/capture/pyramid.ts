/**
 * A fixed-size, multi-resolution min/max pyramid fed one sample at a time. Memory stays bounded
 * however long the capture: the finest level holds at most `maxBuckets` buckets, and when time
 * runs past its end, neighbouring buckets merge pairwise and the bucket width doubles. Coarser
 * levels (each half the size of the one below) are rebuilt from the finest on the first query
 * after new samples, so any time range is answered from the coarsest level that still gives
 * the requested number of points — the best resolution the memory budget allows.
 */
import { assertDecimationRequest, toBucket, type DecimatedBucket } from './decimation';
import { emptyStats, mergeStats, type RunningStats } from './running-stats';

/** Size and starting resolution of a pyramid. */
export interface PyramidOptions {
	/** Finest-level bucket budget; an even number ≥ 4. */
	maxBuckets: number;
	/** Starting bucket width, s; it doubles as the capture grows. */
	initialBucketS: number;
}

/**
 * 65 536 buckets (about 5 MB with the coarser levels) resolve a 10-minute capture to under
 * 10 ms; 10 µs start suits sample rates up to 100 kHz. Sootcast defaults, no published source.
 */
export const DEFAULT_PYRAMID: Readonly<PyramidOptions> = Object.freeze({
	maxBuckets: 65_536,
	initialBucketS: 1e-5
});

/** Struct-of-arrays storage for one level: running statistics per bucket. */
class Level {
	readonly count: Float64Array;
	readonly mean: Float64Array;
	readonly m2: Float64Array;
	readonly min: Float64Array;
	readonly max: Float64Array;
	used = 0;

	constructor(capacity: number) {
		this.count = new Float64Array(capacity);
		this.mean = new Float64Array(capacity);
		this.m2 = new Float64Array(capacity);
		this.min = new Float64Array(capacity).fill(Infinity);
		this.max = new Float64Array(capacity).fill(-Infinity);
	}

	stats(i: number): RunningStats {
		return {
			count: this.count[i],
			mean: this.mean[i],
			m2: this.m2[i],
			min: this.min[i],
			max: this.max[i]
		};
	}

	store(i: number, s: RunningStats): void {
		this.count[i] = s.count;
		this.mean[i] = s.mean;
		this.m2[i] = s.m2;
		this.min[i] = s.min;
		this.max[i] = s.max;
	}

	clear(from: number): void {
		this.count.fill(0, from);
		this.mean.fill(0, from);
		this.m2.fill(0, from);
		this.min.fill(Infinity, from);
		this.max.fill(-Infinity, from);
	}

	/**
	 * Writes the pairwise merge of `source` buckets (2i, 2i+1) into bucket i of this level.
	 * Safe in place (source === this): bucket i is written only after 2i and 2i+1 are read.
	 */
	halveFrom(source: Level): void {
		const pairs = Math.ceil(source.used / 2);
		for (let i = 0; i < pairs; i++) {
			const left = source.stats(2 * i);
			const right = 2 * i + 1 < source.used ? source.stats(2 * i + 1) : emptyStats();
			this.store(i, mergeStats(left, right));
		}
		this.used = pairs;
	}
}

/** Streaming min/max pyramid over (time, value) samples with non-decreasing times. */
export class MinMaxPyramid {
	private readonly capacity: number;
	private readonly fine: Level;
	private widthS: number;
	private originS = NaN;
	private lastTimeS = NaN;
	private samples = 0;
	/** Preallocated coarser levels, capacities maxBuckets/2, /4, … 1. */
	private readonly coarseStore: Level[] = [];
	private coarse: Level[] = [];
	private coarseIsStale = true;

	constructor(options: Partial<PyramidOptions> = {}) {
		const { maxBuckets, initialBucketS } = { ...DEFAULT_PYRAMID, ...options };
		if (!Number.isInteger(maxBuckets) || maxBuckets < 4 || maxBuckets % 2 !== 0) {
			throw new RangeError(`Pyramid bucket budget must be an even integer ≥ 4, got ${maxBuckets}`);
		}
		if (!(initialBucketS > 0)) {
			throw new RangeError(`Pyramid bucket width must be positive, got ${initialBucketS} s`);
		}
		this.capacity = maxBuckets;
		this.fine = new Level(maxBuckets);
		// Each level holds the pairwise merge of the one below, so it needs ceil(half) buckets
		for (let capacity = maxBuckets / 2; ; capacity = Math.ceil(capacity / 2)) {
			this.coarseStore.push(new Level(capacity));
			if (capacity === 1) break;
		}
		this.widthS = initialBucketS;
	}

	/** Adds one sample; times must not decrease (the parser guarantees it). */
	add(timeS: number, value: number): void {
		if (this.samples === 0) this.originS = timeS;
		let index = Math.floor((timeS - this.originS) / this.widthS);
		while (index >= this.capacity) {
			this.coarsen();
			index = Math.floor((timeS - this.originS) / this.widthS);
		}
		// Welford update inlined: this runs once per sample on multi-million-sample files
		const f = this.fine;
		const n = f.count[index] + 1;
		f.count[index] = n;
		const delta = value - f.mean[index];
		f.mean[index] += delta / n;
		f.m2[index] += delta * (value - f.mean[index]);
		if (value < f.min[index]) f.min[index] = value;
		if (value > f.max[index]) f.max[index] = value;
		if (index >= f.used) f.used = index + 1;
		this.samples += 1;
		this.lastTimeS = timeS;
		this.coarseIsStale = true;
	}

	/** Number of samples added. */
	get sampleCount(): number {
		return this.samples;
	}

	/** Time of the first and last sample, s (NaN while empty). */
	get startS(): number {
		return this.originS;
	}

	get endS(): number {
		return this.lastTimeS;
	}

	/** Current finest bucket width, s: the best resolution any query can return. */
	get bucketWidthS(): number {
		return this.widthS;
	}

	/**
	 * Min/max buckets for [t0S, t1S], about `targetPoints` of them. Every stored bucket that
	 * overlaps the range contributes, so the range's true min and max are never lost (values
	 * from just outside the range may join the end buckets, at most one bucket width away).
	 * When even the finest level is coarser than asked, each stored bucket is returned as is.
	 */
	query(t0S: number, t1S: number, targetPoints: number): DecimatedBucket[] {
		assertDecimationRequest(t0S, t1S, targetPoints);
		if (this.samples === 0) return [];
		const targetWidthS = (t1S - t0S) / targetPoints;
		const levelIndex = this.levelFor(targetWidthS);
		const level = levelIndex === 0 ? this.fine : this.levels()[levelIndex - 1];
		const levelWidthS = this.widthS * 2 ** levelIndex;
		const first = Math.max(0, Math.floor((t0S - this.originS) / levelWidthS));
		const last = Math.min(level.used - 1, Math.floor((t1S - this.originS) / levelWidthS));
		const out: DecimatedBucket[] = [];
		let group = emptyStats();
		let groupIndex = -1;
		let groupStartS = 0;
		let groupEndS = 0;
		for (let i = first; i <= last; i++) {
			if (level.count[i] === 0) continue;
			const startS = this.originS + i * levelWidthS;
			const outIndex =
				levelWidthS >= targetWidthS
					? i
					: Math.min(targetPoints - 1, Math.max(0, Math.floor((startS - t0S) / targetWidthS)));
			if (outIndex !== groupIndex) {
				if (group.count > 0) out.push(toBucket(groupStartS, groupEndS, group));
				group = emptyStats();
				groupIndex = outIndex;
				groupStartS = startS;
			}
			group = mergeStats(group, level.stats(i));
			groupEndS = startS + levelWidthS;
		}
		if (group.count > 0) out.push(toBucket(groupStartS, groupEndS, group));
		return out;
	}

	/** Statistics of every finest-level bucket overlapping [t0S, t1S] (exact when aligned). */
	rangeStats(t0S: number, t1S: number): RunningStats {
		let total = emptyStats();
		if (this.samples === 0 || t1S < t0S) return total;
		const first = Math.max(0, Math.floor((t0S - this.originS) / this.widthS));
		const last = Math.min(this.fine.used - 1, Math.floor((t1S - this.originS) / this.widthS));
		for (let i = first; i <= last; i++) total = mergeStats(total, this.fine.stats(i));
		return total;
	}

	/** Buckets of at least `windowS` covering the whole capture, e.g. for phase detection. */
	windows(windowS: number): DecimatedBucket[] {
		if (this.samples === 0) return [];
		const spanS = Math.max(this.lastTimeS - this.originS, this.widthS);
		const points = Math.max(1, Math.floor(spanS / windowS));
		return this.query(this.originS, this.lastTimeS, points);
	}

	/** Coarsest level whose bucket width does not exceed the target width (0 = finest). */
	private levelFor(targetWidthS: number): number {
		let levelIndex = 0;
		const levels = this.levels();
		while (levelIndex < levels.length && this.widthS * 2 ** (levelIndex + 1) <= targetWidthS) {
			levelIndex += 1;
		}
		return levelIndex;
	}

	/** Coarser levels 1…k, rebuilt lazily from the finest after new samples. */
	private levels(): Level[] {
		if (!this.coarseIsStale) return this.coarse;
		let below = this.fine;
		let built = 0;
		while (built < this.coarseStore.length && below.used > 1) {
			const level = this.coarseStore[built];
			level.halveFrom(below);
			below = level;
			built += 1;
		}
		this.coarse = this.coarseStore.slice(0, built);
		this.coarseIsStale = false;
		return this.coarse;
	}

	/** Merges neighbouring finest buckets pairwise and doubles the width: memory stays fixed. */
	private coarsen(): void {
		this.fine.halveFrom(this.fine);
		this.fine.clear(this.fine.used);
		this.widthS *= 2;
		this.coarseIsStale = true;
	}
}
