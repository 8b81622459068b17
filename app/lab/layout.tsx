import Link from "next/link";
import { FlaskConical } from "lucide";
import { LabQueryProvider } from "@/components/lab/query-provider";
import { Icon } from "@/components/ui/icon";
import { hasRole } from "@/lib/roles";
import { requirePageRole } from "@/server/guards";

export default async function LabLayout({ children }: { children: React.ReactNode }) {
  const viewer = await requirePageRole("host", "/lab");
  return (
    <div className="flex flex-col gap-6">
      <div className="flex flex-wrap items-center gap-4 border-b border-line pb-3">
        <p className="inline-flex items-center gap-2 text-sm font-semibold uppercase tracking-wide text-ember">
          <Icon node={FlaskConical} className="h-4 w-4" /> Lab
        </p>
        <nav aria-label="Lab" className="flex flex-wrap gap-1 text-sm font-medium">
          <Link href="/lab/proposals" className="rounded-md px-3 py-1.5 hover:bg-teal-soft">
            Proposals
          </Link>
          <Link href="/lab/pieces" className="rounded-md px-3 py-1.5 hover:bg-teal-soft">
            Piece library
          </Link>
          <Link href="/lab/queue" className="rounded-md px-3 py-1.5 hover:bg-teal-soft">
            Print queue
          </Link>
          <Link href="/lab/jobs" className="rounded-md px-3 py-1.5 hover:bg-teal-soft">
            Run log
          </Link>
          <Link href="/lab/calendar" className="rounded-md px-3 py-1.5 hover:bg-teal-soft">
            Calendar
          </Link>
          <Link href="/lab/calibration" className="rounded-md px-3 py-1.5 hover:bg-teal-soft">
            Calibration
          </Link>
          <Link href="/lab/reports" className="rounded-md px-3 py-1.5 hover:bg-teal-soft">
            Reports
          </Link>
          <Link href="/lab/campaigns" className="rounded-md px-3 py-1.5 hover:bg-teal-soft">
            Campaigns
          </Link>
          <Link href="/lab/fund" className="rounded-md px-3 py-1.5 hover:bg-teal-soft">
            Lab fund
          </Link>
          <Link href="/lab/ledger" className="rounded-md px-3 py-1.5 hover:bg-teal-soft">
            Ledger
          </Link>
          <Link href="/lab/outbox" className="rounded-md px-3 py-1.5 hover:bg-teal-soft">
            Outbox
          </Link>
          {hasRole(viewer.role, "admin") ? (
            <Link href="/lab/printers" className="rounded-md px-3 py-1.5 hover:bg-teal-soft">
              Printers
            </Link>
          ) : null}
          {hasRole(viewer.role, "admin") ? (
            <Link href="/lab/settings" className="rounded-md px-3 py-1.5 hover:bg-teal-soft">
              Settings
            </Link>
          ) : null}
        </nav>
      </div>
      <LabQueryProvider>{children}</LabQueryProvider>
    </div>
  );
}
