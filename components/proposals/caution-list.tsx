import { AlertTriangle } from "lucide";
import { Icon } from "@/components/ui/icon";
import type { Caution } from "@/lib/safety";

/** Safety cautions in the campaign page's style. */
export function CautionList({ cautions, headingId, heading = "Safety in this test", level = 2 }: {
  cautions: Caution[];
  headingId: string;
  heading?: string;
  level?: 2 | 3;
}) {
  const Heading = level === 2 ? "h2" : "h3";
  return (
    <section aria-labelledby={headingId} className="flex flex-col gap-3">
      <Heading id={headingId} className={level === 2 ? "flex items-center gap-2 text-xl font-semibold" : "flex items-center gap-2 text-base font-semibold"}>
        <Icon node={AlertTriangle} className="h-5 w-5 text-ember" /> {heading}
      </Heading>
      <ul className="grid gap-3 sm:grid-cols-2">
        {cautions.map((caution) => (
          <li key={caution.id} className="rounded-lg border border-ember/30 bg-ember-soft/50 p-3 text-sm" data-caution={caution.id}>
            <strong className="block text-ember">{caution.title}</strong>
            {caution.text}
          </li>
        ))}
      </ul>
    </section>
  );
}
