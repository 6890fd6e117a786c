import adapter from '@sveltejs/adapter-node';
import { vitePreprocess } from '@sveltejs/vite-plugin-svelte';

/** @type {import('@sveltejs/kit').Config} */
const config = {
	preprocess: vitePreprocess(),
	compilerOptions: { runes: true },
	kit: {
		adapter: adapter({ out: 'build' }),
		// Content-Security-Policy: SvelteKit adds a nonce or hash for its own inline scripts, so no
		// other script runs; styles allow inline attributes (Svelte and the charts set style="").
		csp: {
			mode: 'auto',
			directives: {
				'default-src': ['self'],
				'script-src': ['self'],
				'style-src': ['self', 'unsafe-inline'],
				'img-src': ['self', 'data:', 'blob:'],
				'font-src': ['self'],
				'connect-src': ['self'],
				'object-src': ['none'],
				'base-uri': ['self'],
				'form-action': ['self'],
				'frame-ancestors': ['none']
			}
		},
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
