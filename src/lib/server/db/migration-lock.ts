import fs from 'node:fs/promises';
import path from 'node:path';
import pg from 'pg';
import { databaseKind, sqliteStorage } from './sequelize';

/** Any fixed number; every Sootcast instance uses the same one. */
const MIGRATION_LOCK_KEY = 72_616_401;
const LOCK_FILE_POLL_MS = 100;
const STALE_EMPTY_LOCK_MS = 10_000;

/**
 * Runs `fn` (the migrations) while holding a lock, so processes starting together migrate one
 * after another instead of racing to create the same tables. PostgreSQL: an advisory lock on a
 * connection of its own, gone when that connection closes. SQLite (one machine): a lock file
 * beside the database holding the owner's pid, taken over when that process is gone.
 */
export async function withMigrationLock<T>(url: string, fn: () => Promise<T>): Promise<T> {
	if (databaseKind(url) === 'postgres') return withAdvisoryLock(url, fn);
	const storage = sqliteStorage(url);
	if (storage === ':memory:') return fn();
	return withLockFile(`${storage}.migrating`, fn);
}

async function withAdvisoryLock<T>(url: string, fn: () => Promise<T>): Promise<T> {
	const client = new pg.Client({ connectionString: url });
	await client.connect();
	try {
		await client.query('SELECT pg_advisory_lock($1)', [MIGRATION_LOCK_KEY]);
		return await fn();
	} finally {
		await client.end();
	}
}

async function withLockFile<T>(file: string, fn: () => Promise<T>): Promise<T> {
	await fs.mkdir(path.dirname(file), { recursive: true });
	for (;;) {
		try {
			await fs.writeFile(file, String(process.pid), { flag: 'wx' });
			break;
		} catch (err) {
			if ((err as NodeJS.ErrnoException).code !== 'EEXIST') throw err;
			if (!(await ownerAlive(file))) await fs.rm(file, { force: true });
			else await new Promise((r) => setTimeout(r, LOCK_FILE_POLL_MS));
		}
	}
	try {
		return await fn();
	} finally {
		await fs.rm(file, { force: true });
	}
}

async function ownerAlive(file: string): Promise<boolean> {
	const text = await fs.readFile(file, 'utf8').catch(() => null);
	if (text === null) return false;
	const pid = Number(text);
	// Created but its pid not written yet: the owner is alive unless the file is old.
	if (!text || !Number.isInteger(pid) || pid <= 0) {
		const stat = await fs.stat(file).catch(() => null);
		return !!stat && Date.now() - stat.mtimeMs < STALE_EMPTY_LOCK_MS;
	}
	try {
		process.kill(pid, 0);
		return true;
	} catch (err) {
		return (err as NodeJS.ErrnoException).code === 'EPERM';
	}
}
