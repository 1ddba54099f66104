import type { ButtonHTMLAttributes } from "react";

type Variant = "primary" | "secondary" | "danger" | "ghost";

const VARIANTS: Record<Variant, string> = {
  primary: "bg-brand text-white hover:bg-brand-dark disabled:bg-slate-400",
  secondary: "bg-white text-brand border-2 border-brand hover:bg-brand-light disabled:text-slate-400 disabled:border-slate-300",
  danger: "bg-fail text-white hover:bg-red-800 disabled:bg-slate-400",
  ghost: "bg-transparent text-brand underline-offset-2 hover:underline",
};

/** A button with a 48 px minimum touch target (min-h-touch); say what it does in its label. */
export function Button({ variant = "primary", className = "", ...props }: ButtonHTMLAttributes<HTMLButtonElement> & { variant?: Variant }) {
  return (
    <button
      {...props}
      className={`inline-flex min-h-touch min-w-touch items-center justify-center gap-2 rounded-md px-4 py-2 text-base font-semibold transition-colors disabled:cursor-not-allowed ${VARIANTS[variant]} ${className}`}
    />
  );
}
