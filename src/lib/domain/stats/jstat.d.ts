// jstat ships no type declarations; the tests use it only as an independent oracle.
declare module 'jstat' {
	const jStat: {
		studentt: {
			inv(p: number, dof: number): number;
			cdf(x: number, dof: number): number;
		};
	};
	export default jStat;
}
