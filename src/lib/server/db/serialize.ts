import type { Sequelize } from 'sequelize';
import { inTransaction } from './sequelize';

/**
 * Makes transactions that name the same `topic` run one after another, until commit or rollback.
 * For read-check-write work (a rate bucket, duplicate and idempotency checks) that must not
 * interleave with a twin request on another connection or instance.
 *
 * PostgreSQL: a transaction-scoped advisory lock on the topic's hash. SQLite: nothing to do, as
 * every write transaction already begins IMMEDIATE and holds the database's one write lock.
 */
export async function serializeOn(sequelize: Sequelize, topic: string): Promise<void> {
	if (!inTransaction()) throw new Error('serializeOn must be called inside a transaction');
	if (sequelize.getDialect() !== 'postgres') return;
	await sequelize.query('SELECT pg_advisory_xact_lock(hashtext(:topic))', {
		replacements: { topic }
	});
}
