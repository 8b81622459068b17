/** The estimate's arithmetic in words, so a backer can check the breakdown line by line. */
export function HowComputed() {
  return (
    <section aria-labelledby="how-computed-heading" className="rounded-lg border border-line bg-paper/60 px-4 py-3 text-sm">
      <h3 id="how-computed-heading" className="font-semibold">
        How this is computed
      </h3>
      <ol className="mt-2 flex list-decimal flex-col gap-1.5 pl-5 text-muted marker:font-mono marker:text-teal">
        <li>
          <strong className="font-medium text-ink">Volume</strong> = filament grams ÷ the material&apos;s density (amounts in
          metres are first turned into grams through the filament&apos;s cross-section).
        </li>
        <li>
          <strong className="font-medium text-ink">Jobs</strong> = pieces × variants (the reference included) × repeats.
        </li>
        <li>
          <strong className="font-medium text-ink">Printer time</strong> = volume ÷ (maximum volumetric flow × efficiency)
          + a heat-up per job + a changeover per variant switch + handling per job. The flow is the lower of the protocol&apos;s
          and the printer&apos;s maximum; efficiency is the share of it a real job averages.
        </li>
        <li>
          <strong className="font-medium text-ink">Cost</strong> = filament × price per kg + machine hours (extrusion and
          heat-up) × the printer&apos;s rate + labour hours (changeovers, handling and the lab&apos;s measuring and write-up) ×
          the labour rate.
        </li>
        <li>
          <strong className="font-medium text-ink">Funding goal</strong> = cost + a contingency for failed prints + the
          payment fee, grossed up so the full amount still reaches the lab after the fee is taken, rounded up to a whole
          currency unit.
        </li>
      </ol>
    </section>
  );
}
