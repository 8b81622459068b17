"use server";

import { revalidatePath } from "next/cache";
import { getDb } from "@/db";
import { finishJobRun, startJobRun } from "@/db/queries/run-log";
import { finishRunSchema, startRunSchema } from "@/lib/validation/run-log";
import { guardedAction, parseInput } from "@/server/action";
import { refreshQueue } from "@/server/queue-refresh";

function revalidateRunLog(jobId: string) {
  revalidatePath(`/lab/jobs/${jobId}`);
  revalidatePath("/lab/jobs");
  revalidatePath("/queue");
}

export async function startRunAction(input: unknown) {
  return guardedAction("host", (viewer) => {
    const db = getDb();
    const { jobId } = parseInput(startRunSchema, input);
    const { run, started } = startJobRun(db, { jobId, userId: viewer.id, now: Date.now() });
    if (started) refreshQueue(db);
    revalidateRunLog(jobId);
    return { runId: run.id, attempt: run.attempt, started };
  });
}

export async function finishRunAction(input: unknown) {
  return guardedAction("host", (viewer) => {
    const db = getDb();
    const { run, repeated } = finishJobRun(db, parseInput(finishRunSchema, input), { userId: viewer.id, now: Date.now() });
    if (!repeated) refreshQueue(db, run.outcome === "failed" ? "a print failed and goes back into the queue" : null);
    revalidateRunLog(run.jobId);
    return { runId: run.id, outcome: run.outcome, repeated };
  });
}
