// autocannon ships no types; this is the part of its API the benchmarks use.
declare module 'autocannon' {
	interface Options {
		url: string;
		connections?: number;
		duration?: number;
		headers?: Record<string, string>;
	}
	interface Instance extends PromiseLike<unknown> {
		on(
			event: 'response',
			listener: (
				client: unknown,
				statusCode: number,
				resBytes: number,
				responseTime: number
			) => void
		): void;
	}
	export default function autocannon(options: Options): Instance;
}
