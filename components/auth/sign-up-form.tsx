"use client";

import Link from "next/link";
import { Button } from "@/components/ui/button";
import { TextField } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import { useActionForm } from "@/components/forms/use-action-form";
import type { ActionResult } from "@/lib/validation/action";
import type { SignUpInput } from "@/lib/validation/auth";

export function SignUpForm({ action, next }: { action: (v: SignUpInput) => Promise<ActionResult<unknown>>; next?: string }) {
  const { form, onSubmit, formError } = useActionForm({
    schema: () => import("@/lib/validation/auth").then((m) => m.signUpSchema),
    action,
    defaultValues: { name: "", email: "", password: "", next },
  });
  const { register, formState } = form;
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4">
      {formError ? <Notice tone="error" title="Couldn't create the account">{formError}</Notice> : null}
      <TextField label="Your name" autoComplete="name" {...register("name")} error={formState.errors.name?.message} />
      <TextField label="Email" type="email" autoComplete="email" inputMode="email" {...register("email")} error={formState.errors.email?.message} />
      <TextField
        label="Password"
        type="password"
        autoComplete="new-password"
        hint="At least 10 characters. A short sentence works well."
        {...register("password")}
        error={formState.errors.password?.message}
      />
      <input type="hidden" {...register("next")} />
      <Button type="submit" className="w-full" disabled={formState.isSubmitting}>
        {formState.isSubmitting ? "Creating your account…" : "Create account"}
      </Button>
      <p className="text-sm">
        Already have an account?{" "}
        <Link className="text-resin underline underline-offset-2" href={next ? `/sign-in?next=${encodeURIComponent(next)}` : "/sign-in"}>Sign in</Link>
      </p>
    </form>
  );
}
