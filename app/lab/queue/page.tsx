import type { Metadata } from "next";
import { QueueBoard } from "@/components/lab/queue-board";
import { requirePageRole } from "@/server/guards";

export const metadata: Metadata = { title: "Print queue · Lab" };

export default async function QueuePage() {
  await requirePageRole("host", "/lab/queue");
  return (
    <div className="flex flex-col gap-4">
      <h1 className="text-2xl font-bold">Print queue</h1>
      <p className="max-w-3xl text-muted">
        Every job of every funded campaign, placed on a printer that can print it: it starts only while someone is in the lab,
        never runs into maintenance, and gets a changeover where the printer switches part or material. Backers&apos; results dates
        follow this board. Never leave a running printer unattended without smoke detection and a fire extinguisher nearby;
        ventilate when ABS or ASA print.
      </p>
      <QueueBoard />
    </div>
  );
}
