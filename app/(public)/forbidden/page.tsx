import type { Metadata } from "next";
import Link from "next/link";
import { ShieldAlert } from "lucide";
import { Icon } from "@/components/ui/icon";
import { Button } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { roleLabels, roles, type Role } from "@/lib/roles";

export const metadata: Metadata = { title: "Not for this account", robots: { index: false } };

export default async function ForbiddenPage({ searchParams }: { searchParams: Promise<{ needs?: string }> }) {
  const { needs } = await searchParams;
  const required = (roles as readonly string[]).includes(needs ?? "") ? (needs as Role) : "host";
  return (
    <div className="mx-auto flex max-w-md flex-col gap-4">
      <Card className="flex flex-col items-start gap-3">
        <Icon node={ShieldAlert} className="h-8 w-8 text-ember" />
        <h1 className="text-2xl font-bold">This part of Proofbay is not for your account</h1>
        <p>It needs the {roleLabels[required]} role. The lab area is where the lab&apos;s hosts triage, plan and run tests.</p>
        <Button asChild variant="secondary">
          <Link href="/">Back to the campaigns</Link>
        </Button>
      </Card>
    </div>
  );
}
