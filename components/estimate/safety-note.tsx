import { AlertTriangle } from "lucide";
import { Icon } from "@/components/ui/icon";
import { materialCautions } from "@/lib/safety";
import { cn } from "@/lib/cn";

/**
 * Cautions for printing the chosen material: always hot parts and fire precautions, plus fumes for
 * styrenics (ABS/ASA) and PTFE-lined hotends for materials printed above about 240 °C.
 */
export function SafetyNote({ material, className }: { material: string; className?: string }) {
  const cautions = materialCautions(material);
  return (
    <section aria-labelledby="calc-safety-heading" className={cn("rounded-lg border border-ember/30 bg-ember-soft/50 p-4 text-sm", className)}>
      <h3 id="calc-safety-heading" className="flex items-center gap-2 font-semibold text-ember">
        <Icon node={AlertTriangle} className="h-4 w-4" /> Safety when printing {material}
      </h3>
      <ul className="mt-2 flex flex-col gap-1.5" data-testid="safety-cautions">
        {cautions.map((caution) => (
          <li key={caution.id} className={cn(caution.id === "fumes" || caution.id === "ptfe" ? "font-medium text-ink" : "text-ink/85")}>
            <strong className="font-semibold">{caution.title}:</strong> {caution.text}
          </li>
        ))}
      </ul>
    </section>
  );
}
