import { afterEach, describe, expect, it, vi } from 'vitest';

// config.ts reads process.env once at import, so each case imports a fresh copy.
async function load(env: Record<string, string | undefined>) {
	vi.resetModules();
	for (const [k, v] of Object.entries(env)) vi.stubEnv(k, v as string);
	return import('./config');
}

afterEach(() => vi.unstubAllEnvs());

describe('configuration', () => {
	it('runs on the embedded SQLite file with nothing set', async () => {
		const { config } = await load({ DATABASE_URL: undefined, APP_SECRET: undefined });
		expect(config.DATABASE_URL).toBe('sqlite:data/sootcast.db');
	});

	it('refuses PostgreSQL without a shared APP_SECRET, naming the variable', async () => {
		await expect(
			load({ DATABASE_URL: 'postgres://sootcast@db.internal/sootcast', APP_SECRET: undefined })
		).rejects.toThrow(/APP_SECRET: set APP_SECRET .* when DATABASE_URL is PostgreSQL/);
	});

	it('accepts PostgreSQL with APP_SECRET set', async () => {
		const { config } = await load({
			DATABASE_URL: 'postgresql://sootcast@db.internal/sootcast',
			APP_SECRET: 'x'.repeat(40)
		});
		expect(config.APP_SECRET).toHaveLength(40);
	});
});
