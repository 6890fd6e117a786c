/**
 * Small seeded pseudo-random generators for simulations and benchmarks.
 * Deterministic: the same seed always gives the same stream, on every platform.
 */

/** A source of uniform numbers in [0, 1). */
export type Uniform = () => number;

/**
 * mulberry32: a 32-bit state generator (public-domain, Tommy Ettinger's design).
 * Good enough for simulation noise; not for cryptography.
 * @param seed any integer; only the low 32 bits are used
 */
export function createUniform(seed: number): Uniform {
	let state = seed >>> 0;
	return () => {
		state = (state + 0x6d2b79f5) >>> 0;
		let t = state;
		t = Math.imul(t ^ (t >>> 15), t | 1);
		t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
		return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
	};
}

/** A seeded source of uniform and normal numbers. */
export interface Random {
	uniform: Uniform;
	/** Standard normal N(0, 1). */
	normal: () => number;
	/** Log-normal with mean 1 (so it scales a mean without biasing it); sigma is the log-scale sd. */
	lognormalMeanOne: (sigma: number) => number;
	/** Poisson count with the given mean (Knuth's method; fine for means below ~30). */
	poisson: (mean: number) => number;
}

/**
 * Seeded random source: mulberry32 uniforms, Box–Muller normals (Box & Muller, 1958).
 * @param seed any integer
 */
export function createRandom(seed: number): Random {
	const uniform = createUniform(seed);
	let spare: number | null = null;
	const normal = (): number => {
		if (spare !== null) {
			const value = spare;
			spare = null;
			return value;
		}
		// 1 − u keeps the logarithm's argument in (0, 1].
		const u1 = 1 - uniform();
		const u2 = uniform();
		const radius = Math.sqrt(-2 * Math.log(u1));
		spare = radius * Math.sin(2 * Math.PI * u2);
		return radius * Math.cos(2 * Math.PI * u2);
	};
	const lognormalMeanOne = (sigma: number): number =>
		Math.exp(sigma * normal() - (sigma * sigma) / 2);
	const poisson = (mean: number): number => {
		if (mean <= 0) return 0;
		const limit = Math.exp(-mean);
		let count = 0;
		let product = uniform();
		while (product > limit) {
			count++;
			product *= uniform();
		}
		return count;
	};
	return { uniform, normal, lognormalMeanOne, poisson };
}
