import type { Db } from "./client";

export type Tx = Parameters<Parameters<Db["transaction"]>[0]>[0];

/**
 * Group commit: units of work that arrive while the event loop is busy are written in one
 * IMMEDIATE transaction, each inside its own savepoint, and each caller's promise settles only
 * after that transaction committed.
 *
 * Why: with `synchronous=FULL` every commit waits for an fsync of the WAL (about 4 ms on the demo
 * machine), so one commit per webhook event caps the endpoint near 200 events/s. Sharing the fsync
 * keeps the durability (nobody is answered before their work is on disk) and multiplies the rate.
 * A unit that throws rolls back to its savepoint and rejects only its own caller; the others
 * commit. If the commit itself fails, every caller in the batch is rejected.
 */
export type GroupCommit = <T>(work: (tx: Tx) => T) => Promise<T>;

export function createGroupCommit(getDb: () => Db, options: { maxBatch?: number } = {}) {
  const maxBatch = options.maxBatch ?? 256;
  type Pending = { work: (tx: Tx) => unknown; resolve(value: unknown): void; reject(reason: unknown): void };
  let queue: Pending[] = [];
  let scheduled = false;

  const flush = () => {
    scheduled = false;
    const batch = queue.slice(0, maxBatch);
    queue = queue.slice(batch.length);
    if (queue.length > 0) schedule();
    const outcomes: ({ ok: true; value: unknown } | { ok: false; error: unknown })[] = [];
    try {
      getDb().transaction(
        (tx) => {
          for (const item of batch) {
            try {
              outcomes.push({ ok: true, value: tx.transaction((savepoint) => item.work(savepoint)) });
            } catch (error) {
              outcomes.push({ ok: false, error });
            }
          }
        },
        { behavior: "immediate" },
      );
    } catch (error) {
      for (const item of batch) item.reject(error);
      return;
    }
    batch.forEach((item, i) => {
      const outcome = outcomes[i];
      if (outcome?.ok) item.resolve(outcome.value);
      else item.reject(outcome?.error ?? new Error("The unit of work did not run."));
    });
  };

  function schedule() {
    if (scheduled) return;
    scheduled = true;
    setImmediate(flush);
  }

  return function commit<T>(work: (tx: Tx) => T): Promise<T> {
    return new Promise<T>((resolve, reject) => {
      queue.push({ work, resolve: resolve as (value: unknown) => void, reject });
      schedule();
    });
  };
}

const shared = new WeakMap<Db, GroupCommit>();

/** The one group committer of a database connection, shared by every caller in the process. */
export function groupCommitFor(db: Db): GroupCommit {
  let commit = shared.get(db);
  if (!commit) {
    commit = createGroupCommit(() => db);
    shared.set(db, commit);
  }
  return commit;
}
