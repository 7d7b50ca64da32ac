import type { Metadata } from "next";
import { RegisterForm } from "@/components/owner/register-form";
import { Card, PageHeader } from "@/components/ui/card";
import { registerAction } from "./actions";

export const metadata: Metadata = { title: "Register a piece" };

export default async function RegisterPage({ searchParams }: { searchParams: Promise<Record<string, string | undefined>> }) {
  const code = (await searchParams).code?.slice(0, 40);
  return (
    <>
      <PageHeader title="Register a piece" lead="Type the registration code from the card in your piece's drawer. Scanning the card's QR code does the same." />
      <Card>
        <RegisterForm action={registerAction} code={code} />
      </Card>
      <p className="mt-4 text-sm text-muted">
        Bought or were given a piece someone else registered? Ask them to release it in Grainward — they get a new code to hand to you.
      </p>
    </>
  );
}
