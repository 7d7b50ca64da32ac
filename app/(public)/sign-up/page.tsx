import type { Metadata } from "next";
import { AuthCard } from "@/components/auth/auth-card";
import { SignUpForm } from "@/components/auth/sign-up-form";
import { safeNextPath } from "@/lib/auth/next-path";
import { signUpAction } from "./actions";

export const metadata: Metadata = { title: "Create an account" };

export default async function SignUpPage({ searchParams }: { searchParams: Promise<Record<string, string | undefined>> }) {
  const next = safeNextPath((await searchParams).next);
  return (
    <AuthCard title="Create your account" lead="For owners of a piece: register it from the card in its drawer, and we'll keep its care on track.">
      <SignUpForm action={signUpAction} next={next} />
    </AuthCard>
  );
}
