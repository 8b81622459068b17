import Link from "next/link";
import { FlaskConical, LogIn, UserRound } from "lucide";
import { Icon } from "@/components/ui/icon";
import { hasRole, roleLabels } from "@/lib/roles";
import type { Viewer } from "@/server/auth";
import { Logo } from "./logo";

export function SiteHeader({ viewer }: { viewer: Viewer | null }) {
  return (
    <header className="border-b border-line bg-surface">
      <div className="mx-auto flex max-w-6xl items-center gap-x-3 px-3 py-3 sm:gap-x-6 sm:px-6">
        <Link href="/" className="flex items-center gap-2 text-teal-strong">
          <Logo className="h-7 w-7" />
          {/* On narrow phones the mark alone stands for the name, so the four links fit. */}
          <span className="sr-only text-lg font-bold tracking-tight min-[560px]:not-sr-only">Proofbay</span>
          <span className="hidden text-sm font-medium text-muted lg:inline">Harbor Street Print Lab</span>
        </Link>
        <nav aria-label="Main" className="flex flex-1 items-center justify-end gap-0.5 text-[13px] font-medium sm:gap-1 sm:text-sm">
          <Link href="/" className="rounded-md px-1.5 py-2 hover:bg-teal-soft sm:px-3">
            Campaigns
          </Link>
          <Link href="/proposals" className="rounded-md px-1.5 py-2 hover:bg-teal-soft sm:px-3">
            Proposals
          </Link>
          <Link href="/reports" className="rounded-md px-1.5 py-2 hover:bg-teal-soft sm:px-3">
            Reports
          </Link>
          <Link href="/queue" className="rounded-md px-1.5 py-2 hover:bg-teal-soft sm:px-3">
            Queue
          </Link>
          <Link href="/calculator" className="rounded-md px-1.5 py-2 hover:bg-teal-soft sm:px-3">
            Calculator
          </Link>
          <Link href="/club" className="rounded-md px-1.5 py-2 hover:bg-teal-soft sm:px-3">
            Club
          </Link>
          {viewer && hasRole(viewer.role, "host") ? (
            <Link href="/lab" className="inline-flex items-center gap-1.5 rounded-md px-1.5 py-2 hover:bg-teal-soft sm:px-3">
              <Icon node={FlaskConical} className="h-4 w-4" /> Lab
            </Link>
          ) : null}
          {viewer ? (
            <Link href="/account" className="inline-flex items-center gap-1.5 rounded-md px-1.5 py-2 hover:bg-teal-soft sm:px-3">
              <Icon node={UserRound} className="h-4 w-4" />
              <span className="sr-only truncate md:not-sr-only md:max-w-40">{viewer.name ?? viewer.email}</span>
              <span className="sr-only">({roleLabels[viewer.role]})</span>
            </Link>
          ) : (
            <Link href="/sign-in" className="inline-flex items-center gap-1.5 rounded-md bg-teal px-2 py-2 text-white sm:px-3 hover:bg-teal-strong">
              <Icon node={LogIn} className="hidden h-4 w-4 sm:block" /> Sign in
            </Link>
          )}
        </nav>
      </div>
      <div className="layer-band h-[11px] opacity-15" aria-hidden="true" />
    </header>
  );
}
