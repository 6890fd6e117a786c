import { spawn } from 'node:child_process';
import fs from 'node:fs';
import { createReadStream } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import sqlite3 from 'sqlite3';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { factories } from './factories';
import { postgresServerUrl } from './test-database';

// SQLite's online backup, taken while an import's transaction is open. PostgreSQL backups are
// pg_dump's business (docs/deploy.md), so the PostgreSQL run of the suite skips this file.
const onPostgres = !!postgresServerUrl();
const ROWS = 120_000;
const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'sootcast-backup-'));
const dbFile = path.join(dir, 'live.db');
if (!onPostgres) {
	process.env.DATABASE_URL = `sqlite:${dbFile}`;
	process.env.STORAGE_DIR = path.join(dir, 'uploads');
	process.env.IMPORT_MAX_ROWS = String(ROWS);
}
const tsx = path.resolve('node_modules/.bin/tsx');

function cli(script: string, args: string[], databaseFile: string) {
	return new Promise<{ code: number | null; output: string }>((resolve) => {
		const child = spawn(tsx, [`src/lib/server/cli/${script}.ts`, ...args], {
			env: { ...process.env, DATABASE_URL: `sqlite:${databaseFile}` },
			stdio: ['ignore', 'pipe', 'pipe']
		});
		let output = '';
		child.stdout.on('data', (d) => (output += d));
		child.stderr.on('data', (d) => (output += d));
		child.once('exit', (code) => resolve({ code, output }));
	});
}

/** A raw connection's view: rows of the imported vans, and whether a writer holds the lock. */
function raw(file: string) {
	const conn = new sqlite3.Database(file);
	const get = <T>(sql: string) =>
		new Promise<T>((res, rej) => conn.get(sql, (e, r) => (e ? rej(e) : res(r as T))));
	const run = (sql: string) =>
		new Promise<void>((res, rej) => conn.run(sql, (e) => (e ? rej(e) : res())));
	return {
		count: async () =>
			(
				await get<{ n: number }>(
					`SELECT COUNT(*) AS n FROM readings WHERE vehicle_id IN (SELECT id FROM vehicles WHERE registration LIKE 'BKP %')`
				)
			).n,
		integrity: async () =>
			(await get<{ integrity_check: string }>('PRAGMA integrity_check')).integrity_check,
		/** True while another connection holds the write lock (busy timeout 0: no waiting). */
		writerActive: async () => {
			try {
				await run('BEGIN IMMEDIATE');
				await run('ROLLBACK');
				return false;
			} catch (err) {
				if ((err as { code?: string }).code === 'SQLITE_BUSY') return true;
				throw err;
			}
		},
		close: () => new Promise<void>((res) => conn.close(() => res()))
	};
}

describe.skipIf(onPostgres)('backups of the SQLite database', () => {
	let db: typeof import('../../src/lib/server/db');
	let imports: typeof import('../../src/lib/server/services/imports');
	let backup: typeof import('../../src/lib/server/db/backup');
	let user: import('../../src/lib/server/auth/lucia').SessionUser;
	let csv = '';

	beforeAll(async () => {
		db = await import('../../src/lib/server/db');
		imports = await import('../../src/lib/server/services/imports');
		backup = await import('../../src/lib/server/db/backup');
		await db.migrate();
		const make = factories(db);
		const fleet = await make.organisation('Kestrel Row Logistics', 'fleet');
		const manager = await make.person(fleet.id, 'backup.manager@kestrelrow.test', 'fleet_manager');
		user = {
			id: manager.id,
			email: manager.email,
			name: manager.name,
			role: 'fleet_manager',
			organisationId: fleet.id,
			unitPreference: 'mbar',
			locale: 'en-GB',
			timeZone: 'Europe/London'
		} as never;
		const lines = ['registration,taken_at,dp_mbar,odometer_km'];
		const now = Date.now();
		for (let v = 0; v < 6; v++) {
			await make.van(fleet.id, `BKP ${10 + v}`);
			for (let k = 0; k < ROWS / 6; k++)
				lines.push(
					`BKP ${10 + v},${new Date(now - (k + 1) * 1_800_000 - v * 1000).toISOString()},${80 + (k % 150)},${200_000 - k}`
				);
		}
		csv = path.join(dir, 'readings.csv');
		fs.writeFileSync(csv, lines.join('\n') + '\n');
	});

	afterAll(async () => {
		await db?.closeDb();
		fs.rmSync(dir, { recursive: true, force: true });
	});

	it('taken while an import is being saved, restores to a sound database with none or all of it', async () => {
		const staged = await imports.stageImportFile(user, {
			fileName: 'readings.csv',
			body: createReadStream(csv)
		});
		const probe = raw(dbFile);
		let saving = false;
		const importing = imports.runImport(
			user,
			staged.uploadId,
			{ kind: 'readings', unit: 'mbar', dateFormat: 'iso', condition: 'idle' },
			new Date(),
			(p) => (saving ||= p.phase === 'saving')
		);
		// Wait until the import's transaction holds the write lock, then back up in the middle of it.
		while (!saving || !(await probe.writerActive())) await new Promise((r) => setTimeout(r, 5));
		const during = path.join(dir, 'during.db');
		await backup.backupSqlite(dbFile, during);
		const stillWriting = await probe.writerActive();
		const result = await importing;
		expect(result.stored).toBe(ROWS);
		await probe.close();

		// Restore with the command a person runs, into a fresh database file.
		const restoredFile = path.join(dir, 'restored-during.db');
		const restored = await cli('restore', [during], restoredFile);
		expect(restored.code, restored.output).toBe(0);
		const check = raw(restoredFile);
		expect(await check.integrity()).toBe('ok');
		const rows = await check.count();
		await check.close();
		expect([0, ROWS]).toContain(rows);
		// The import's transaction was still open when the copy finished: none of it may be there.
		expect(stillWriting, 'the copy should finish while the import is still saving').toBe(true);
		expect(rows).toBe(0);
	});

	it('npm run db:backup copies the live database, and db:restore puts it back over a changed one', async () => {
		const copy = path.join(dir, 'after.db');
		const taken = await cli('backup', [copy], dbFile);
		expect(taken.code, taken.output).toBe(0);
		expect(taken.output).toMatch(/integrity ok/);
		// One self-contained file: no write-ahead log left beside it.
		expect(fs.existsSync(`${copy}-wal`) || fs.existsSync(`${copy}-shm`)).toBe(false);

		// Change the live database, then restore: the change is gone, the old state is saved aside.
		await db.Reading.destroy({ where: {} });
		await db.closeDb();
		const refused = await cli('restore', [copy], dbFile);
		expect(refused.code).toBe(1);
		expect(refused.output).toMatch(/Stop Sootcast first, then run again with --yes/);
		const restored = await cli('restore', [copy, '--yes'], dbFile);
		expect(restored.code, restored.output).toBe(0);
		expect(restored.output).toMatch(/The current database was saved to .*before-restore-/);
		const check = raw(dbFile);
		expect(await check.integrity()).toBe('ok');
		expect(await check.count()).toBe(ROWS);
		await check.close();
	});

	it('refuses to restore a file that is not a sound database and leaves the target alone', async () => {
		const junk = path.join(dir, 'junk.db');
		fs.writeFileSync(junk, 'SQLite format 3\0'.padEnd(4096, 'x'));
		const target = path.join(dir, 'untouched.db');
		const before = await cli('backup', [target], dbFile);
		expect(before.code, before.output).toBe(0);
		const result = await cli('restore', [junk, '--yes'], target);
		expect(result.code).toBe(1);
		expect(result.output).toMatch(
			/is not a sound SQLite database; nothing was restored|is not a sound SQLite database/
		);
		const check = raw(target);
		expect(await check.count()).toBe(ROWS);
		await check.close();
	});
});
