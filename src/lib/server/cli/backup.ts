/**
 * `npm run db:backup [-- FILE]`: a consistent copy of the SQLite database while the app runs.
 * Without FILE the copy goes to backups/sootcast-YYYYMMDD-HHMMSS.db beside the database.
 */
import fs from 'node:fs/promises';
import path from 'node:path';
import { config } from '../config';
import { backupSqlite } from '../db/backup';
import { databaseKind, sqliteStorage } from '../db/sequelize';

export function defaultBackupPath(databaseFile: string, now = new Date()): string {
	const stamp = now.toISOString().replace(/[-:]/g, '').replace('T', '-').slice(0, 15);
	return path.join(path.dirname(databaseFile), 'backups', `sootcast-${stamp}.db`);
}

if (databaseKind(config.DATABASE_URL) !== 'sqlite') {
	console.error(
		'db:backup copies the embedded SQLite database. For PostgreSQL use pg_dump (see docs/deploy.md).'
	);
	process.exit(2);
}
const source = sqliteStorage(config.DATABASE_URL);
const destination = path.resolve(process.argv[2] ?? defaultBackupPath(source));
try {
	const started = Date.now();
	await backupSqlite(source, destination);
	const { size } = await fs.stat(destination);
	console.log(
		`Backed up ${source} to ${destination} (${(size / 1024 / 1024).toFixed(1)} MB, integrity ok, ${Date.now() - started} ms).`
	);
} catch (err) {
	console.error(`Backup failed: ${err instanceof Error ? err.message : String(err)}`);
	process.exit(1);
}
