import type { Metadata } from "next";
import { AuthCard } from "@/components/auth/auth-card";
import { SignInForm } from "@/components/auth/sign-in-form";
import { Notice } from "@/components/ui/notice";
import { safeNextPath } from "@/lib/auth/next-path";
import { signInAction } from "./actions";

export const metadata: Metadata = { title: "Sign in" };

export default async function SignInPage({ searchParams }: { searchParams: Promise<Record<string, string | undefined>> }) {
  const params = await searchParams;
  const next = safeNextPath(params.next);
  return (
    <AuthCard title="Sign in" lead="Owners, studio staff and technicians all sign in here.">
      {params.verified === "1" ? <Notice tone="ok" title="E-mail confirmed">Sign in to carry on.</Notice> : null}
      {params["signed-out"] === "1" ? <Notice tone="ok" title="Signed out">You are signed out on this device.</Notice> : null}
      <SignInForm action={signInAction} next={next} />
    </AuthCard>
  );
}
