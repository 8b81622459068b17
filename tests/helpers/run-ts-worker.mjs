// Starts a TypeScript worker thread: registers tsx's loader in this thread, then loads the file named in workerData.
import { workerData } from "node:worker_threads";
import { pathToFileURL } from "node:url";
import { register } from "tsx/esm/api";

register();
await import(pathToFileURL(workerData.script).href);
