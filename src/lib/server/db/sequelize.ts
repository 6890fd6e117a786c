import path from 'node:path';
import { AsyncLocalStorage } from 'node:async_hooks';
import sqlite3 from 'sqlite3';
import { Sequelize, Transaction, type Options } from 'sequelize';
import { config } from '../config';

const BUSY_TIMEOUT_MS = 5_000;

/**
 * sqlite3 with our per-connection settings. Sequelize opens one connection per transaction,
 * so the settings must be applied on every open, not once at start-up.
 */
class TunedDatabase extends sqlite3.Database {
	constructor(filename: string, mode?: number, callback?: (err: Error | null) => void) {
		super(filename, mode ?? sqlite3.OPEN_READWRITE | sqlite3.OPEN_CREATE, callback);
		this.configure('busyTimeout', BUSY_TIMEOUT_MS);
		this.run('PRAGMA journal_mode=WAL');
		this.run('PRAGMA synchronous=NORMAL');
		this.run('PRAGMA foreign_keys=ON');
	}
}
const tunedSqlite3 = { ...sqlite3, Database: TunedDatabase };

/**
 * A continuation-local namespace on AsyncLocalStorage, so every query inside
 * `sequelize.transaction(async () => …)` joins that transaction without passing it around.
 */
const store = new AsyncLocalStorage<Map<string, unknown>>();
const transactionNamespace = {
	run(fn: (ctx: Map<string, unknown>) => unknown) {
		const ctx = new Map(store.getStore() ?? []);
		return store.run(ctx, () => fn(ctx));
	},
	bind<F extends (...args: never[]) => unknown>(fn: F): F {
		return fn;
	},
	get(key: string) {
		return store.getStore()?.get(key);
	},
	set(key: string, value: unknown) {
		store.getStore()?.set(key, value);
	}
};
Sequelize.useCLS(transactionNamespace);

/** True while the calling code runs inside `getDb().transaction(async () => …)`. */
export function inTransaction(): boolean {
	return transactionNamespace.get('transaction') !== undefined;
}

export type DatabaseKind = 'sqlite' | 'postgres';

export function databaseKind(url: string): DatabaseKind {
	if (url.startsWith('sqlite:')) return 'sqlite';
	if (url.startsWith('postgres://') || url.startsWith('postgresql://')) return 'postgres';
	throw new Error(
		`DATABASE_URL must start with sqlite: or postgres:// (got "${url.split(':')[0]}:")`
	);
}

/** `sqlite:data/x.db` → absolute path; `sqlite::memory:` stays in memory. */
export function sqliteStorage(url: string): string {
	const rest = url.slice('sqlite:'.length).replace(/^\/\//, '');
	if (rest === ':memory:') return rest;
	return path.resolve(rest);
}

export function createSequelize(url: string = config.DATABASE_URL): Sequelize {
	const common: Options = {
		logging: config.LOG_SQL ? console.log : false,
		define: { underscored: true, timestamps: true }
	};
	if (databaseKind(url) === 'sqlite') {
		return queueWriteTransactions(
			new Sequelize({
				...common,
				dialect: 'sqlite',
				dialectModule: tunedSqlite3,
				storage: sqliteStorage(url),
				// IMMEDIATE takes the write lock up front, so two writers queue on the busy
				// timeout instead of one failing when its read lock cannot be upgraded.
				transactionType: Transaction.TYPES.IMMEDIATE
			})
		);
	}
	return new Sequelize(url, { ...common, dialect: 'postgres' });
}

/**
 * SQLite has one writer at a time, and sqlite3 waits for the write lock on one of libuv's four
 * threads. Dozens of transactions begun at once (an API burst) would fill those threads with
 * waiters while the holder cannot get a thread to finish: every one then times out. So this
 * process queues its own transactions and lets one at a time at the lock; other processes (the
 * jobs worker) still meet it through the busy timeout. A transaction begun inside another runs
 * unqueued, as before.
 */
function queueWriteTransactions(sequelize: Sequelize): Sequelize {
	const begin = sequelize.transaction.bind(sequelize) as (...args: unknown[]) => Promise<unknown>;
	let tail: Promise<unknown> = Promise.resolve();
	(sequelize as unknown as { transaction: unknown }).transaction = (...args: unknown[]) => {
		const managed = args.some((a) => typeof a === 'function');
		if (!managed || inTransaction()) return begin(...args);
		const run = tail.then(() => begin(...args));
		tail = run.catch(() => undefined);
		return run;
	};
	return sequelize;
}
