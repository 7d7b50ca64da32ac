import Link from "next/link";
import type { ButtonHTMLAttributes, ComponentProps } from "react";
import { cn } from "./cn";

const variants = {
  primary: "bg-resin text-white hover:bg-resin-dark",
  secondary: "border border-line bg-card text-ink hover:border-resin hover:text-resin",
  danger: "bg-danger text-white hover:bg-danger/90",
  ghost: "text-resin hover:bg-resin-soft",
} as const;

type Variant = keyof typeof variants;
// A disabled button of any kind is drawn faded (it was only for primary: a disabled secondary, danger or
// ghost button looked as pressable as any other, e.g. the only admin's own "Remove" on the team page).
const base =
  "inline-flex min-h-11 items-center justify-center gap-2 rounded-lg px-4 py-2 text-sm font-semibold transition-colors disabled:cursor-not-allowed disabled:opacity-50";

export function Button({
  variant = "primary",
  className,
  type = "button",
  ...props
}: ButtonHTMLAttributes<HTMLButtonElement> & { variant?: Variant }) {
  return <button type={type} className={cn(base, variants[variant], className)} {...props} />;
}

export function ButtonLink({ variant = "primary", className, ...props }: ComponentProps<typeof Link> & { variant?: Variant }) {
  return <Link className={cn(base, variants[variant], className)} {...props} />;
}
