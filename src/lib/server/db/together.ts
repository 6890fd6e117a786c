import { inTransaction } from './sequelize';

/**
 * Runs independent queries side by side, like Promise.all over thunks. Outside a transaction
 * each takes its own pooled connection; inside one they share a single connection, and a
 * PostgreSQL connection answers one query at a time, so there they run one after another.
 */
export async function together<T extends readonly unknown[]>(
	...tasks: { [K in keyof T]: () => Promise<T[K]> | T[K] }
): Promise<T> {
	if (!inTransaction()) return Promise.all(tasks.map((task) => task())) as unknown as Promise<T>;
	const results: unknown[] = [];
	for (const task of tasks) results.push(await task());
	return results as unknown as T;
}
