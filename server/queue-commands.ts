import "server-only";
import { env } from "@/lib/env";

/** What the queue board's commands pass to the recompute they run: the base URL for mail links and the time. */
export function queueCommandOptions() {
  return { appUrl: env.appUrl, now: new Date() };
}
