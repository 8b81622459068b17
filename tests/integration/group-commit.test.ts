import Database from "better-sqlite3";
import { afterEach, beforeEach, describe, expect, it } from "vitest";
import { createGroupCommit } from "@/db/group-commit";
import { processorEvents } from "@/db/schema";
import { createTempDb } from "../helpers/temp-db";

let temp: ReturnType<typeof createTempDb>;
beforeEach(() => {
  temp = createTempDb();
});
afterEach(() => temp.cleanup());

const record = (id: string) => ({ id, type: "test.event", receivedAt: new Date(0) });

describe("group commit", () => {
  it("commits units that arrive together in one transaction and answers each after the commit", async () => {
    let transactions = 0;
    // The committer asks for the database once per transaction it opens.
    const commit = createGroupCommit(() => {
      transactions++;
      return temp.db;
    });
    const observer = new Database(temp.file, { readonly: true });
    const visibleAtResolve: number[] = [];
    const units = Array.from({ length: 50 }, (_, i) =>
      commit((tx) => {
        tx.insert(processorEvents).values(record(`evt_${i}`)).run();
        return i;
      }).then((value) => {
        // A second connection sees the row: the caller hears back only after the commit.
        const row = observer.prepare("select count(*) as n from processor_event where id = ?").get(`evt_${value}`) as { n: number };
        visibleAtResolve.push(row.n);
        return value;
      }),
    );
    const values = await Promise.all(units);
    observer.close();
    expect(values).toEqual(Array.from({ length: 50 }, (_, i) => i));
    expect(visibleAtResolve.every((n) => n === 1)).toBe(true);
    expect(transactions).toBe(1);
  });

  it("rolls back only the unit that throws; the rest of the batch commits", async () => {
    const commit = createGroupCommit(() => temp.db);
    const results = await Promise.allSettled([
      commit((tx) => tx.insert(processorEvents).values(record("evt_a")).run()),
      commit((tx) => {
        tx.insert(processorEvents).values(record("evt_b")).run();
        throw new Error("crash before commit");
      }),
      commit((tx) => tx.insert(processorEvents).values(record("evt_c")).run()),
    ]);
    expect(results.map((r) => r.status)).toEqual(["fulfilled", "rejected", "fulfilled"]);
    const ids = temp.db.select({ id: processorEvents.id }).from(processorEvents).all().map((r) => r.id).sort();
    expect(ids).toEqual(["evt_a", "evt_c"]);
  });

  it("splits a long queue into batches of at most maxBatch", async () => {
    let transactions = 0;
    const commit = createGroupCommit(
      () => {
        transactions++;
        return temp.db;
      },
      { maxBatch: 10 },
    );
    await Promise.all(
      Array.from({ length: 35 }, (_, i) =>
        commit((tx) => {
          tx.insert(processorEvents).values(record(`evt_${i}`)).run();
        }),
      ),
    );
    expect(temp.db.select().from(processorEvents).all()).toHaveLength(35);
    expect(transactions).toBe(4);
  });
});
