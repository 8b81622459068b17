import { Slot } from "@radix-ui/react-slot";
import type { ButtonHTMLAttributes } from "react";
import { cn } from "@/lib/cn";

const variants = {
  primary: "bg-teal text-white hover:bg-teal-strong",
  secondary: "bg-surface text-ink border border-line hover:border-teal hover:text-teal",
  quiet: "text-teal hover:bg-teal-soft",
  danger: "bg-rose text-white hover:opacity-90",
} as const;

type ButtonProps = ButtonHTMLAttributes<HTMLButtonElement> & {
  variant?: keyof typeof variants;
  size?: "sm" | "md";
  asChild?: boolean;
};

export function Button({ variant = "primary", size = "md", asChild = false, className, ...props }: ButtonProps) {
  const Component = asChild ? Slot : "button";
  return (
    <Component
      className={cn(
        "inline-flex items-center justify-center gap-2 rounded-lg font-semibold transition-colors disabled:cursor-not-allowed disabled:opacity-60",
        size === "md" ? "px-4 py-2.5 text-sm" : "px-3 py-1.5 text-xs",
        variants[variant],
        className,
      )}
      {...props}
    />
  );
}
