import adapter from '@sveltejs/adapter-node';
import { vitePreprocess } from '@sveltejs/vite-plugin-svelte';

/** @type {import('@sveltejs/kit').Config} */
const config = {
	preprocess: vitePreprocess(),
	compilerOptions: { runes: true },
	kit: {
		adapter: adapter({ out: 'build' }),
		typescript: {
			config: (tsconfig) => {
				// svelte-check also covers the scheduled jobs and the benchmarks.
				tsconfig.include.push('../jobs/**/*.ts', '../bench/**/*.ts', '../tests/**/*.ts');
				return tsconfig;
			}
		}
	}
};

export default config;
