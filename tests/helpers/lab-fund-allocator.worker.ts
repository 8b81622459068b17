import { randomUUID } from "node:crypto";
import { parentPort, workerData } from "node:worker_threads";
import { openDatabase } from "../../db/client";
import { allocateLabFund } from "../../db/queries/lab-fund";

/**
 * One host on its own database connection (its own thread), allocating the same amount again and
 * again as soon as the gate opens, to race the other workers for the lab fund's balance.
 */
type Job = { file: string; campaignId: string; hostId: string; amountMinor: number; attempts: number; gate: SharedArrayBuffer };
const job = workerData as Job;
const db = openDatabase(job.file);
Atomics.wait(new Int32Array(job.gate), 0, 0);
let allocated = 0;
let refused = 0;
const unexpected: string[] = [];
for (let attempt = 0; attempt < job.attempts; attempt++) {
  try {
    allocateLabFund(db, { campaignId: job.campaignId, hostId: job.hostId, amount: { minor: job.amountMinor }, requestId: randomUUID(), appUrl: "http://proofbay.test" });
    allocated++;
  } catch (error) {
    if ((error as { code?: string }).code === "invalid_amount") refused++;
    else unexpected.push(error instanceof Error ? error.message : String(error));
  }
}
db.$client.close();
parentPort?.postMessage({ allocated, refused, unexpected });
