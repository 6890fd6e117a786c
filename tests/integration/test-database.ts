import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { randomUUID } from 'node:crypto';
import pg from 'pg';

/**
 * A fresh, empty database for one test file (or the shared server). SQLite by default: a file in
 * a temporary folder. With TEST_POSTGRES_URL set (`.ci/run` sets it for the second run), a new
 * PostgreSQL database on that server instead, dropped again by `drop()`.
 */
export interface TestDatabase {
	url: string;
	kind: 'sqlite' | 'postgres';
	drop(): Promise<void>;
}

export const postgresServerUrl = (): string | undefined =>
	process.env.TEST_POSTGRES_URL || undefined;

export async function createTestDatabase(label: string): Promise<TestDatabase> {
	const server = postgresServerUrl();
	if (!server) {
		const dir = fs.mkdtempSync(path.join(os.tmpdir(), `sootcast-${label}-`));
		return {
			url: `sqlite:${path.join(dir, 'db.sqlite')}`,
			kind: 'sqlite',
			drop: async () => fs.rmSync(dir, { recursive: true, force: true })
		};
	}
	const name =
		`sootcast_${label.replace(/[^a-z0-9]/gi, '_')}_${randomUUID().slice(0, 8)}`.toLowerCase();
	await adminQuery(server, `CREATE DATABASE ${name}`);
	const url = new URL(server);
	url.pathname = `/${name}`;
	return {
		url: url.toString(),
		kind: 'postgres',
		drop: () => adminQuery(server, `DROP DATABASE IF EXISTS ${name} WITH (FORCE)`)
	};
}

async function adminQuery(serverUrl: string, sql: string): Promise<void> {
	const client = new pg.Client({ connectionString: serverUrl });
	await client.connect();
	try {
		await client.query(sql);
	} finally {
		await client.end();
	}
}
