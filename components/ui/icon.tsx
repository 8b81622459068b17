import { createElement } from "react";
import type { IconNode } from "lucide";
import { cn } from "@/lib/cn";

/**
 * Renders a Lucide icon as plain SVG on the server. lucide-react marks every icon "use client",
 * which would ship each one in the page's JavaScript; the same icon data from `lucide` costs none.
 */
export function Icon({ node, className, label }: { node: IconNode; className?: string; label?: string }) {
  return (
    <svg
      xmlns="http://www.w3.org/2000/svg"
      viewBox="0 0 24 24"
      fill="none"
      stroke="currentColor"
      strokeWidth={2}
      strokeLinecap="round"
      strokeLinejoin="round"
      className={cn("h-4 w-4 shrink-0", className)}
      role={label ? "img" : undefined}
      aria-label={label}
      aria-hidden={label ? undefined : true}
    >
      {node.map(([tag, attributes], index) => createElement(tag, { ...attributes, key: index }))}
    </svg>
  );
}
