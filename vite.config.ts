/// <reference types="vitest/config" />
import tailwindcss from '@tailwindcss/vite';
import { sveltekit } from '@sveltejs/kit/vite';
import { defineConfig } from 'vite';

export default defineConfig({
	plugins: [tailwindcss(), sveltekit()],
	test: {
		projects: [
			{
				extends: true,
				test: {
					name: 'unit',
					environment: 'node',
					include: ['src/**/*.test.ts', 'jobs/**/*.test.ts', 'tests/unit/**/*.test.ts'],
					exclude: ['src/**/*.integration.test.ts'],
					setupFiles: ['tests/unit/fast-check-setup.ts']
				}
			},
			{
				extends: true,
				test: {
					name: 'integration',
					environment: 'node',
					include: ['src/**/*.integration.test.ts', 'tests/integration/**/*.test.ts'],
					globalSetup: ['tests/integration/global-setup.ts'],
					fileParallelism: false,
					// The tests' own processes (workers, CLIs) share one signing key, as instances must.
					env: { APP_SECRET: 'integration-tests-secret-0123456789abcdef' },
					testTimeout: 60_000,
					hookTimeout: 120_000
				}
			}
		]
	}
});
