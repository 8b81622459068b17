/** `npm run bench`: every speed budget the issues name, measured on this machine, printed and saved. */
import { mkdirSync, writeFileSync } from "node:fs";
import { runBoardBench } from "./board";

type Check = { name: string; figure: string; budget: string; pass: boolean };

const checks: Check[] = [];
const results: Record<string, unknown> = { machine: { node: process.version, cpus: (await import("node:os")).cpus().length } };

const board = await runBoardBench();
results.board = board;
checks.push(
  { name: "board p50 (1 connection)", figure: `${board.p50Ms} ms`, budget: "< 50 ms", pass: board.p50Ms < 50 },
  {
    name: "board first-load JS (gzip)",
    figure: `${(board.firstLoadJsGzipBytes / 1024).toFixed(1)} kB in ${board.scripts} scripts`,
    budget: "< 130 kB",
    pass: board.firstLoadJsGzipBytes < 130 * 1024,
  },
  { name: "board throughput (10 connections)", figure: `${Math.round(board.requestsPerSecond)} req/s`, budget: "(reported)", pass: true },
);

mkdirSync("bench/out", { recursive: true });
writeFileSync("bench/out/results.json", JSON.stringify({ at: new Date().toISOString(), results, checks }, null, 2));
console.table(checks);
if (checks.some((check) => !check.pass)) {
  console.error("Some budgets were missed.");
  process.exitCode = 1;
}
