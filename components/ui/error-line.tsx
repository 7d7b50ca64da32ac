import type { ReactNode } from "react";
import { cn } from "./cn";

/**
 * One line saying what went wrong — a field's message or a refused request's — read out as it appears
 * (role="alert"). Renders nothing when there is nothing to say, so callers pass the message as it is.
 */
export function ErrorLine({ id, className, children }: { id?: string; className?: string; children?: ReactNode }) {
  if (children === null || children === undefined || children === false || children === "") return null;
  return (
    <p id={id} role="alert" className={cn("text-sm font-medium text-danger", className)}>
      {children}
    </p>
  );
}
