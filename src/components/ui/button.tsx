import type { ButtonHTMLAttributes, Ref } from "react";
import { cn } from "@/lib/cn";

type Variant = "primary" | "secondary" | "quiet" | "danger";

const variants: Record<Variant, string> = {
  primary: "bg-accent text-paper-raised hover:bg-accent-hover border border-accent",
  secondary: "bg-paper-raised text-ink border border-rule-strong hover:border-ink-muted",
  quiet: "text-accent hover:text-accent-hover hover:underline underline-offset-2 px-0! border border-transparent",
  danger: "bg-paper-raised text-danger border border-rule-strong hover:border-danger",
};

// React 19 passes `ref` as a prop: it reaches the <button> with the rest, so a screen can move focus to it.
export type ButtonProps = ButtonHTMLAttributes<HTMLButtonElement> & {
  variant?: Variant;
  size?: "sm" | "md";
  ref?: Ref<HTMLButtonElement>;
};

export function Button({ variant = "primary", size = "md", className, type = "button", ...rest }: ButtonProps) {
  return (
    <button
      type={type}
      className={cn(
        "inline-flex items-center justify-center gap-1.5 rounded-sm font-medium whitespace-nowrap transition-colors",
        "disabled:cursor-not-allowed disabled:opacity-55",
        size === "sm" ? "h-7 px-2.5 text-sm" : "h-8.5 px-3.5 text-sm",
        variants[variant],
        className,
      )}
      {...rest}
    />
  );
}
