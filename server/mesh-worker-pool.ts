import "server-only";
import { existsSync } from "node:fs";
import { availableParallelism } from "node:os";
import path from "node:path";
import { Worker } from "node:worker_threads";
import { MeshError } from "@/lib/estimate/mesh/mesh-error";
import type { ModelAnalysisSettings, ModelMeasurement } from "@/lib/validation/model-analysis";
import type { MeshAnalysisLimits, MeshJobReply, MeshJobRequest } from "./mesh-analysis";

/**
 * The compiled worker entry (`npm run build:worker`, which `npm run build` and `npm run dev` run
 * first). It lives outside .next so Turbopack neither bundles nor moves it; `next start` runs in
 * the project directory, so it is found from process.cwd().
 */
export function defaultMeshWorkerFile(): string {
  return path.join(process.cwd(), "dist-worker", "server", "mesh-worker.js");
}

export interface MeshWorkerPoolOptions {
  /** Worker threads; default max(1, CPUs − 1) so one core stays free for the event loop. */
  readonly size?: number;
  /** Jobs that may wait for a free worker; one more is refused with `busy`. */
  readonly maxQueue?: number;
  /** A job still running after this long has its worker terminated. */
  readonly timeoutMs?: number;
  /** A worker idle this long is stopped, giving back the memory of its last mesh. */
  readonly idleTimeoutMs?: number;
  readonly workerFile?: string;
}

export type MeshJobFailureKind = "busy" | "timeout" | "crashed" | "aborted" | "input" | "internal";

/** A job that did not produce a measurement for a reason other than the mesh itself (that is a MeshError). */
export class MeshJobFailure extends Error {
  constructor(
    readonly kind: MeshJobFailureKind,
    message: string,
    readonly field?: string,
  ) {
    super(message);
    this.name = "MeshJobFailure";
  }
}

export interface MeshJob {
  readonly filePath: string;
  readonly settings: ModelAnalysisSettings;
  readonly limits: MeshAnalysisLimits;
  readonly signal?: AbortSignal;
}

interface PendingJob {
  readonly job: MeshJob;
  readonly resolve: (result: ModelMeasurement) => void;
  readonly reject: (error: Error) => void;
}

interface Slot {
  readonly worker: Worker;
  running?: { readonly id: number; readonly pending: PendingJob; readonly timer: NodeJS.Timeout };
  idleTimer?: NodeJS.Timeout;
}

/**
 * A fixed number of long-lived worker threads and a bounded FIFO queue in front of them. A worker
 * that crashes or times out is replaced; idle workers do not keep the process alive.
 */
export class MeshWorkerPool {
  readonly size: number;
  readonly maxQueue: number;
  readonly timeoutMs: number;
  readonly idleTimeoutMs: number;
  readonly workerFile: string;
  private readonly slots: Slot[] = [];
  private readonly queue: PendingJob[] = [];
  private nextJobId = 1;
  private closed = false;

  constructor(options: MeshWorkerPoolOptions = {}) {
    this.size = Math.max(1, Math.floor(options.size ?? availableParallelism() - 1));
    this.maxQueue = options.maxQueue ?? 16;
    this.timeoutMs = options.timeoutMs ?? 120_000;
    this.idleTimeoutMs = options.idleTimeoutMs ?? 30_000;
    this.workerFile = options.workerFile ?? defaultMeshWorkerFile();
    if (!existsSync(this.workerFile)) {
      throw new Error(`The mesh worker is not built: ${this.workerFile} is missing. Run \`npm run build:worker\`.`);
    }
  }

  stats(): { size: number; workers: number; busy: number; queued: number } {
    return {
      size: this.size,
      workers: this.slots.length,
      busy: this.slots.filter((slot) => slot.running).length,
      queued: this.queue.length,
    };
  }

  /** Resolves with the measurement; rejects with MeshError (a bad mesh) or MeshJobFailure. */
  run(job: MeshJob): Promise<ModelMeasurement> {
    if (this.closed) return Promise.reject(new MeshJobFailure("internal", "the mesh worker pool is closed"));
    if (job.signal?.aborted) return Promise.reject(new MeshJobFailure("aborted", "the request was aborted"));
    const busy = this.slots.length >= this.size && this.slots.every((slot) => slot.running);
    if (busy && this.queue.length >= this.maxQueue) {
      return Promise.reject(new MeshJobFailure("busy", "every mesh worker is busy and the queue is full"));
    }
    return new Promise<ModelMeasurement>((resolve, reject) => {
      const pending: PendingJob = { job, resolve, reject };
      this.queue.push(pending);
      job.signal?.addEventListener("abort", () => this.dropQueued(pending), { once: true });
      this.dispatch();
    });
  }

  async close(): Promise<void> {
    this.closed = true;
    for (const pending of this.queue.splice(0)) pending.reject(new MeshJobFailure("internal", "the mesh worker pool closed"));
    const slots = this.slots.splice(0);
    for (const slot of slots) {
      clearTimeout(slot.idleTimer);
      if (slot.running) {
        clearTimeout(slot.running.timer);
        slot.running.pending.reject(new MeshJobFailure("internal", "the mesh worker pool closed"));
        slot.running = undefined;
      }
    }
    await Promise.all(slots.map((slot) => slot.worker.terminate()));
  }

  private dropQueued(pending: PendingJob): void {
    const index = this.queue.indexOf(pending);
    if (index < 0) return; // already running: let it finish, its worker stays useful
    this.queue.splice(index, 1);
    pending.reject(new MeshJobFailure("aborted", "the request was aborted"));
  }

  private dispatch(): void {
    while (this.queue.length > 0) {
      const slot = this.slots.find((candidate) => !candidate.running) ?? this.spawn();
      if (!slot) return;
      const pending = this.queue.shift()!;
      const id = this.nextJobId++;
      clearTimeout(slot.idleTimer);
      const timer = setTimeout(() => this.timedOut(slot, id), this.timeoutMs);
      slot.running = { id, pending, timer };
      slot.worker.ref();
      const message: MeshJobRequest = {
        jobId: id,
        filePath: pending.job.filePath,
        settings: pending.job.settings,
        limits: pending.job.limits,
      };
      slot.worker.postMessage(message);
    }
  }

  private spawn(): Slot | undefined {
    if (this.closed || this.slots.length >= this.size) return undefined;
    const worker = new Worker(this.workerFile);
    const slot: Slot = { worker };
    worker.unref();
    worker.on("message", (reply: MeshJobReply) => this.replied(slot, reply));
    worker.on("error", (error) => this.lost(slot, new MeshJobFailure("crashed", `the mesh worker failed: ${error.message}`)));
    worker.on("exit", (code) => this.lost(slot, new MeshJobFailure("crashed", `the mesh worker exited with code ${code}`)));
    this.slots.push(slot);
    return slot;
  }

  private replied(slot: Slot, reply: MeshJobReply): void {
    const running = slot.running;
    if (!running || running.id !== reply.jobId) return;
    clearTimeout(running.timer);
    slot.running = undefined;
    slot.worker.unref();
    if (reply.ok) running.pending.resolve(reply.result);
    else {
      const { failure } = reply;
      if (failure.kind === "mesh") running.pending.reject(new MeshError(failure.code, failure.message));
      else if (failure.kind === "input") running.pending.reject(new MeshJobFailure("input", failure.message, failure.field));
      else running.pending.reject(new MeshJobFailure("internal", failure.message));
    }
    this.dispatch();
    if (!slot.running) {
      slot.idleTimer = setTimeout(() => this.retire(slot), this.idleTimeoutMs);
      slot.idleTimer.unref();
    }
  }

  private retire(slot: Slot): void {
    const index = this.slots.indexOf(slot);
    if (index < 0 || slot.running) return;
    this.slots.splice(index, 1);
    void slot.worker.terminate();
  }

  private timedOut(slot: Slot, id: number): void {
    if (slot.running?.id !== id) return;
    const seconds = Math.round(this.timeoutMs / 1000);
    this.lost(slot, new MeshJobFailure("timeout", `the analysis took longer than ${seconds} s`));
    void slot.worker.terminate();
  }

  /** Removes a worker that crashed, exited or timed out, fails its job and lets a fresh one start. */
  private lost(slot: Slot, failure: MeshJobFailure): void {
    const index = this.slots.indexOf(slot);
    if (index < 0) return;
    this.slots.splice(index, 1);
    clearTimeout(slot.idleTimer);
    if (slot.running) {
      clearTimeout(slot.running.timer);
      // Running out of heap in the worker is the mesh being too big for this server.
      const outOfMemory = /ERR_WORKER_OUT_OF_MEMORY|out of memory/i.test(failure.message);
      slot.running.pending.reject(
        outOfMemory ? new MeshError("too_large", "the mesh needs more memory than the analyser has") : failure,
      );
      slot.running = undefined;
    }
    this.dispatch();
  }
}

const globalForPool = globalThis as typeof globalThis & { proofbayMeshWorkerPool?: MeshWorkerPool };

/** The app's shared pool, created on first use (kept on globalThis so dev reloads do not leak workers). */
export function getMeshWorkerPool(): MeshWorkerPool {
  globalForPool.proofbayMeshWorkerPool ??= new MeshWorkerPool();
  return globalForPool.proofbayMeshWorkerPool;
}
