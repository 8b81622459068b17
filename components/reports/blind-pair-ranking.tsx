import Link from "next/link";
import { getDb } from "@/db";
import { MIN_COMPARISONS_PER_VARIANT, MIN_RANKING_VOTES } from "@/lib/judging/rules";
import { campaignRanking } from "@/server/blind-pair-ranking";
import { BlindPairChart } from "./blind-pair-chart";

/**
 * The audience's ranking of the variants from blind-pair votes (Bradley–Terry, MM fit, ties as half
 * a win each, 1,000-resample bootstrap intervals). Shown once there are at least 30 votes and
 * every variant is in at least 5 comparisons; until then, how many more votes are needed.
 */
export function BlindPairRanking({ campaignId, judgeHref }: { campaignId: string; judgeHref?: string }) {
  const { ranking, variantCount } = campaignRanking(getDb(), campaignId);
  if (variantCount < 2) return null;

  return (
    <section aria-labelledby="blind-pairs-heading" className="flex flex-col gap-3" data-testid="blind-pair-ranking">
      <h2 id="blind-pairs-heading" className="text-xl font-semibold">
        Blind pairs: what backers preferred
      </h2>
      {ranking.ready ? (
        <>
          <p className="text-sm text-muted">
            From {ranking.totalVotes} blind votes on photo pairs of the same piece. Bars show each variant&apos;s chance of being
            picked over a variant of average strength; whiskers are 95 % intervals from {ranking.replicates.toLocaleString("en-US")} resamples of the votes.
            &ldquo;Can&apos;t tell&rdquo; counts as half a vote for each side.
          </p>
          <BlindPairChart rows={ranking.variants.map((v) => ({ name: v.name, chance: v.chancePercent, low: v.lowPercent, high: v.highPercent, isReference: v.isReference }))} />
          <table className="w-full text-sm">
            <caption className="sr-only">Blind-pair ranking of the variants</caption>
            <thead className="border-b border-line text-left text-muted">
              <tr>
                <th scope="col" className="py-1.5 pr-3 font-medium">Rank</th>
                <th scope="col" className="py-1.5 pr-3 font-medium">Variant</th>
                <th scope="col" className="py-1.5 pr-3 text-right font-medium">Picked over average</th>
                <th scope="col" className="py-1.5 pr-3 text-right font-medium">95 % interval</th>
                <th scope="col" className="py-1.5 text-right font-medium">Comparisons</th>
              </tr>
            </thead>
            <tbody>
              {ranking.variants.map((variant, i) => (
                <tr key={variant.id} className="border-b border-line last:border-0">
                  <td className="py-1.5 pr-3">{i + 1}</td>
                  <td className="py-1.5 pr-3">
                    {variant.name}
                    {variant.isReference ? <span className="ml-2 rounded bg-slate-soft px-1.5 text-xs text-muted">reference</span> : null}
                  </td>
                  <td className="py-1.5 pr-3 text-right font-mono">{variant.chancePercent.toFixed(0)} %</td>
                  <td className="py-1.5 pr-3 text-right font-mono">
                    {variant.lowPercent.toFixed(0)}–{variant.highPercent.toFixed(0)} %
                  </td>
                  <td className="py-1.5 text-right font-mono">{variant.comparisons}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </>
      ) : (
        <p className="rounded-lg border border-line bg-slate-soft/60 p-3 text-sm" data-testid="blind-pair-votes-needed">
          {ranking.totalVotes} {ranking.totalVotes === 1 ? "vote" : "votes"} so far; at least {ranking.votesNeeded} more{" "}
          {ranking.votesNeeded === 1 ? "vote is" : "votes are"} needed before the ranking is shown (it needs {MIN_RANKING_VOTES} votes
          and every variant in {MIN_COMPARISONS_PER_VARIANT} comparisons).
        </p>
      )}
      {judgeHref ? (
        <p className="text-sm">
          <Link href={judgeHref} className="font-medium text-teal underline-offset-2 hover:underline">
            Backed this test? Judge blind pairs
          </Link>
        </p>
      ) : null}
    </section>
  );
}
