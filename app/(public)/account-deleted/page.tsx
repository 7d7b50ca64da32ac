import type { Metadata } from "next";
import Link from "next/link";
import { AuthCard } from "@/components/auth/auth-card";

export const metadata: Metadata = { title: "Account deleted", robots: { index: false } };

// Where deleting an account lands (app/(owner)/account/delete/actions.ts): signed out, so a public page.
export default function AccountDeletedPage() {
  return (
    <AuthCard title="Your account is deleted" lead="You're signed out everywhere.">
      <div className="space-y-3 text-sm">
        <p>Any pieces you held are released, your open claims withdrawn and your waiting quotes declined. Your name, e-mail address and password are gone from Grainward.</p>
        <p>Each released piece&apos;s new registration code is on its way to your old address, in case you pass it on.</p>
        <p>
          <Link href="/" className="font-semibold text-resin underline">
            Go to the start page
          </Link>
        </p>
      </div>
    </AuthCard>
  );
}
