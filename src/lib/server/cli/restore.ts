/**
 * `npm run db:restore -- FILE --yes`: replaces the SQLite database with a backup. The current
 * database is first backed up beside it (backups/before-restore-….db), so a restore can be undone.
 * Stop the app first: running sessions and jobs would otherwise carry on against the old state.
 */
import fs from 'node:fs/promises';
import path from 'node:path';
import { config } from '../config';
import { backupSqlite, restoreSqlite } from '../db/backup';
import { databaseKind, sqliteStorage } from '../db/sequelize';

if (databaseKind(config.DATABASE_URL) !== 'sqlite') {
	console.error(
		'db:restore restores the embedded SQLite database. For PostgreSQL use pg_restore (see docs/deploy.md).'
	);
	process.exit(2);
}
const args = process.argv.slice(2);
const file = args.find((a) => !a.startsWith('--'));
if (!file) {
	console.error('Usage: npm run db:restore -- BACKUP_FILE --yes');
	process.exit(2);
}
const target = sqliteStorage(config.DATABASE_URL);
const targetExists = await fs.access(target).then(
	() => true,
	() => false
);
if (targetExists && !args.includes('--yes')) {
	console.error(
		`This replaces everything in ${target} with ${path.resolve(file)}.\nStop Sootcast first, then run again with --yes.`
	);
	process.exit(1);
}
try {
	if (targetExists) {
		const stamp = new Date().toISOString().replace(/[-:]/g, '').replace('T', '-').slice(0, 15);
		const safety = path.join(path.dirname(target), 'backups', `before-restore-${stamp}.db`);
		await backupSqlite(target, safety);
		console.log(`The current database was saved to ${safety}.`);
	}
	await restoreSqlite(path.resolve(file), target);
	console.log(
		`Restored ${target} from ${path.resolve(file)}. Start Sootcast to apply any newer migrations.`
	);
} catch (err) {
	console.error(`Restore failed: ${err instanceof Error ? err.message : String(err)}`);
	process.exit(1);
}
