// Entry of a mesh-analysis worker thread. It is not bundled by Next: `npm run build:worker`
// compiles it and the engine it imports to CommonJS in dist-worker/ (tsconfig.worker.json), and
// server/mesh-worker-pool.ts starts dist-worker/server/mesh-worker.js by absolute path.
import { parentPort } from "node:worker_threads";
import { runMeshJob, type MeshJobRequest } from "./mesh-analysis";

if (!parentPort) throw new Error("server/mesh-worker runs only as a worker thread");
const port = parentPort;
port.on("message", (job: MeshJobRequest) => {
  port.postMessage(runMeshJob(job));
});
