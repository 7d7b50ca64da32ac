import type { Metadata } from "next";
import { AuthCard } from "@/components/auth/auth-card";
import { SignUpForm } from "@/components/auth/sign-up-form";
import { safeNextPath } from "@/lib/auth/next-path";
import { signUpAction } from "./actions";

export const metadata: Metadata = { title: "Create an account" };

export default async function SignUpPage({ searchParams }: { searchParams: Promise<Record<string, string | undefined>> }) {
  const next = safeNextPath((await searchParams).next);
  // Someone on their way to start a studio (app/(public)/start/page.tsx) is not an owner with a drawer card.
  const startingStudio = next === "/start" || next?.startsWith("/start?");
  const lead = startingStudio
    ? "The account you'll sign in with as the studio's admin. Once you've confirmed your e-mail, we bring you back to set up the studio."
    : "For owners of a piece: register it from the card in its drawer, and we'll keep its care on track.";
  return (
    <AuthCard title="Create your account" lead={lead}>
      <SignUpForm action={signUpAction} next={next} />
    </AuthCard>
  );
}
