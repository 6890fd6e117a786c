import fs from 'node:fs/promises';
import path from 'node:path';
import sqlite3 from 'sqlite3';

/**
 * SQLite backups through SQLite's online backup API, never a file copy: the copy is one
 * consistent snapshot even while the app writes (a file copy can catch a half-written page or
 * miss the WAL). A transaction in progress is either wholly in the copy or not at all.
 */

type BackupHandle = {
	step(pages: number, cb: (err: Error | null) => void): void;
	finish(cb?: (err: Error | null) => void): void;
	completed: boolean;
	failed: boolean;
};

function open(file: string, mode: number): Promise<sqlite3.Database> {
	return new Promise((resolve, reject) => {
		const db = new sqlite3.Database(file, mode, (err) => (err ? reject(err) : resolve(db)));
	});
}

function close(db: sqlite3.Database): Promise<void> {
	return new Promise((resolve, reject) => db.close((err) => (err ? reject(err) : resolve())));
}

/** Copies every page between `db` and `file`; `fileIsDestination` chooses the direction. */
async function copyPages(db: sqlite3.Database, file: string, fileIsDestination: boolean) {
	const backup = await new Promise<BackupHandle>((resolve, reject) => {
		const b = (
			db as unknown as {
				backup(
					f: string,
					d: string,
					s: string,
					dest: boolean,
					cb: (e: Error | null) => void
				): BackupHandle;
			}
		).backup(file, 'main', 'main', fileIsDestination, (err) => (err ? reject(err) : resolve(b)));
	});
	try {
		// -1: all pages in one step, so the copy is a single read snapshot of the source. A busy
		// or locked database is retried by the driver until the step gets through.
		while (!backup.completed && !backup.failed) {
			await new Promise<void>((resolve, reject) =>
				backup.step(-1, (err) => (err ? reject(err) : resolve()))
			);
		}
		if (backup.failed) throw new Error('The SQLite backup step failed.');
	} finally {
		await new Promise<void>((resolve) => backup.finish(() => resolve()));
	}
}

/** `PRAGMA integrity_check` of a database file: 'ok', or SQLite's list of problems. */
export async function integrityCheck(file: string): Promise<string> {
	const db = await open(file, sqlite3.OPEN_READONLY);
	try {
		const rows = await new Promise<{ integrity_check: string }[]>((resolve, reject) =>
			db.all('PRAGMA integrity_check', (err, r) => (err ? reject(err) : resolve(r as never)))
		);
		return rows.map((r) => r.integrity_check).join('; ');
	} finally {
		await close(db);
	}
}

/** Takes a consistent copy of the live database `source` into the new file `destination`. */
export async function backupSqlite(source: string, destination: string): Promise<void> {
	await fs.access(source).catch(() => {
		throw new Error(`There is no database at ${source}.`);
	});
	if (await exists(destination))
		throw new Error(`${destination} already exists; choose a new name.`);
	await fs.mkdir(path.dirname(destination), { recursive: true });
	const db = await open(source, sqlite3.OPEN_READONLY);
	try {
		await copyPages(db, destination, true);
	} finally {
		await close(db);
	}
	// The copy inherits the live database's WAL mode; switch it back so the backup is one
	// self-contained file (no -wal or -shm beside it, before or after it is opened).
	const copy = await open(destination, sqlite3.OPEN_READWRITE);
	try {
		await new Promise<void>((resolve, reject) =>
			copy.run('PRAGMA journal_mode=DELETE', (err) => (err ? reject(err) : resolve()))
		);
	} finally {
		await close(copy);
	}
	const check = await integrityCheck(destination);
	if (check !== 'ok') {
		await fs.rm(destination, { force: true });
		throw new Error(`The copy failed SQLite's integrity check (${check}); nothing was kept.`);
	}
}

/**
 * Replaces the database `target` with the backup `backupFile`, page by page through the same
 * API (so a target that is open elsewhere is switched whole, never left half-written). The
 * backup is checked first; a damaged one is refused and the target left as it was.
 */
export async function restoreSqlite(backupFile: string, target: string): Promise<void> {
	if (!(await exists(backupFile))) throw new Error(`There is no backup at ${backupFile}.`);
	const check = await integrityCheck(backupFile).catch((err: Error) => err.message);
	if (check !== 'ok')
		throw new Error(
			`${backupFile} is not a sound SQLite database (${check}); nothing was restored.`
		);
	await fs.mkdir(path.dirname(target), { recursive: true });
	const db = await open(target, sqlite3.OPEN_READWRITE | sqlite3.OPEN_CREATE);
	try {
		await copyPages(db, backupFile, false);
	} finally {
		await close(db);
	}
}

async function exists(file: string): Promise<boolean> {
	return fs.access(file).then(
		() => true,
		() => false
	);
}
