import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { Scale } from "lucide";
import { JudgePairs } from "@/components/blind-pairs/judge-pairs";
import { Button } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { Icon } from "@/components/ui/icon";
import { getDb } from "@/db";
import { canJudge, findJudgingContext } from "@/db/queries/blind-pairs";
import { showNextPair } from "@/server/blind-pairs";
import { requirePageRole } from "@/server/guards";

export const dynamic = "force-dynamic";

type Props = { params: Promise<{ slug: string }> };

export async function generateMetadata({ params }: Props): Promise<Metadata> {
  const context = findJudgingContext(getDb(), (await params).slug);
  return { title: context ? `Blind pairs: ${context.campaign.title}` : "Campaign not found", robots: { index: false } };
}

/** Blind-pair judging for backers of a reported campaign (and early-access members before that). */
export default async function JudgePage({ params }: Props) {
  const { slug } = await params;
  const viewer = await requirePageRole("supporter", `/campaigns/${slug}/judge`);
  const db = getDb();
  const context = findJudgingContext(db, slug);
  if (!context) notFound();
  const now = new Date();
  const access = canJudge(db, viewer.id, context, now);

  return (
    <div className="mx-auto flex max-w-4xl flex-col gap-6">
      <header className="flex flex-col gap-2">
        <p className="flex items-center gap-2 text-sm font-medium uppercase tracking-wide text-muted">
          <Icon node={Scale} className="h-4 w-4" /> Blind pairs
        </p>
        <h1 className="text-3xl font-bold tracking-tight">{context.campaign.title}</h1>
        <p className="text-muted">
          Two photos of the same test piece, printed as two different variants, under the same light. Which names they carry is
          hidden, and the sides are shuffled. Pick the better print, or say you can&apos;t tell — that is a useful answer too.
        </p>
      </header>
      {access.allowed ? (
        <>
          {access.as === "early" && context.report?.state !== "published" ? (
            <p className="rounded-lg border border-teal/30 bg-teal-soft p-3 text-sm">Early access: the report is not published yet, so you are among the first to judge.</p>
          ) : null}
          <JudgePairs slug={slug} initial={showNextPair(db, context, viewer.id, now)} />
        </>
      ) : (
        <Card className="flex flex-col items-start gap-3" data-testid="judge-refused">
          <h2 className="text-lg font-semibold">{access.code === "no_pairs" ? "Nothing to judge yet" : "Judging is for this campaign's backers"}</h2>
          <p>{access.message}</p>
          <Button asChild variant="secondary">
            <Link href={`/campaigns/${slug}`}>Back to the campaign</Link>
          </Button>
        </Card>
      )}
    </div>
  );
}
