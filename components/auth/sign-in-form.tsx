"use client";

import Link from "next/link";
import { Button } from "@/components/ui/button";
import { TextField } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import { useActionForm } from "@/components/forms/use-action-form";
import type { ActionResult } from "@/lib/validation/action";
import type { SignInInput } from "@/lib/validation/auth";

export function SignInForm({ action, next }: { action: (v: SignInInput) => Promise<ActionResult<unknown>>; next?: string }) {
  const { form, onSubmit, formError } = useActionForm({ schema: () => import("@/lib/validation/auth").then((m) => m.signInSchema), action, defaultValues: { email: "", password: "", next } });
  const { register, formState } = form;
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4">
      {formError ? <Notice tone="error" title="Couldn't sign you in">{formError}</Notice> : null}
      <TextField label="Email" type="email" autoComplete="email" inputMode="email" {...register("email")} error={formState.errors.email?.message} />
      <TextField label="Password" type="password" autoComplete="current-password" {...register("password")} error={formState.errors.password?.message} />
      <input type="hidden" {...register("next")} />
      <Button type="submit" className="w-full" disabled={formState.isSubmitting}>
        {formState.isSubmitting ? "Signing in…" : "Sign in"}
      </Button>
      <p className="flex flex-wrap justify-between gap-2 text-sm">
        <Link className="text-resin underline underline-offset-2" href="/forgot-password">Forgot your password?</Link>
        <Link className="text-resin underline underline-offset-2" href={next ? `/sign-up?next=${encodeURIComponent(next)}` : "/sign-up"}>Create an account</Link>
      </p>
    </form>
  );
}
