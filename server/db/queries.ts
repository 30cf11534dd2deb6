import type { Transaction } from 'sequelize';

type Results<T extends readonly (() => Promise<unknown>)[]> = { -readonly [K in keyof T]: Awaited<ReturnType<T[K]>> };

/**
 * Runs independent queries: side by side on the pool when there is no transaction, one after another inside one
 * (a transaction is one connection, and pg refuses a query while the connection is still busy with another).
 */
export async function allOf<const T extends readonly (() => Promise<unknown>)[]>(transaction: Transaction | null | undefined, tasks: T): Promise<Results<T>> {
  if (!transaction) return (await Promise.all(tasks.map((t) => t()))) as Results<T>;
  const out: unknown[] = [];
  for (const task of tasks) out.push(await task());
  return out as Results<T>;
}
