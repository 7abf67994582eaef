import type { ButtonHTMLAttributes } from "react";
import { Link, type LinkProps } from "react-router-dom";
import { cx } from "./cx";

type Variant = "primary" | "secondary" | "danger" | "ghost";
const styles: Record<Variant, string> = {
  primary: "bg-ink text-paper hover:bg-ink-soft",
  secondary: "bg-paper-raised text-ink border border-paper-line hover:bg-paper-sunk",
  danger: "bg-stop text-white hover:bg-stop/90",
  ghost: "text-ink hover:bg-paper-sunk",
};
const base = "inline-flex items-center justify-center gap-2 rounded-md px-4 py-2 text-sm font-semibold min-h-10 disabled:opacity-50 disabled:cursor-not-allowed transition-colors";

export function Button({ variant = "primary", className, ...props }: ButtonHTMLAttributes<HTMLButtonElement> & { variant?: Variant }) {
  return <button type="button" className={cx(base, styles[variant], className)} {...props} />;
}

export function ButtonLink({ variant = "secondary", className, ...props }: LinkProps & { variant?: Variant }) {
  return <Link className={cx(base, styles[variant], className)} {...props} />;
}
