import type { Metadata } from "next";
import Link from "next/link";
import { Button } from "@/components/ui/button";
import { Card, PageHeader } from "@/components/ui/card";
import { TextField } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import { SpriteIcon } from "@/components/ui/sprite-icon";
import { clientIp, getCurrentSession } from "@/lib/auth/session";
import { lookupCard } from "@/lib/owner/registration";
import { CardConfirm } from "../../(public)/r/card-confirm";

export const metadata: Metadata = { title: "Register a piece" };

// Typing a code: the form asks the page for `?lookup=<code>`, and the page shows which piece that is
// with the same confirmation as the card's QR code (/r/<code>). `?code=` only fills the field in.
export default async function RegisterPage({ searchParams }: { searchParams: Promise<Record<string, string | undefined>> }) {
  const sp = await searchParams;
  const lookup = sp.lookup?.trim().slice(0, 40);
  const { user } = await getCurrentSession();
  const found = lookup ? await lookupCard(lookup, await clientIp(), user) : null;

  if (found && "card" in found) {
    return (
      <>
        <PageHeader title="Register a piece" lead="Check that this is the piece, then register it." />
        <Card>
          <CardConfirm found={found} user={user} here={`/register?lookup=${encodeURIComponent(found.code)}`} />
        </Card>
        <p className="mt-4 text-sm">
          <Link href="/register" className="inline-flex min-h-11 items-center text-resin underline">
            Not this piece? Type another code
          </Link>
        </p>
      </>
    );
  }
  return (
    <>
      <PageHeader title="Register a piece" lead="Type the registration code from the card in your piece's drawer. Scanning the card's QR code does the same." />
      <Card>
        <form method="get" action="/register" className="space-y-4">
          {found ? (
            <Notice tone={found.state === "rate_limited" ? "warn" : "error"} title="Check the code">
              {found.message}
            </Notice>
          ) : null}
          <TextField
            label="Registration code"
            name="lookup"
            required
            maxLength={40}
            autoComplete="off"
            autoCapitalize="characters"
            spellCheck={false}
            placeholder="XXXX-XXXX-XXXX-X"
            className="font-mono text-lg tracking-wider"
            defaultValue={found?.code ?? sp.code?.slice(0, 40) ?? ""}
            hint="13 symbols from the card in the drawer. Capitals, spaces and dashes don't matter."
          />
          <Button type="submit" className="w-full">
            <SpriteIcon name="search" className="size-4" />
            Find the piece
          </Button>
        </form>
      </Card>
      <p className="mt-4 text-sm text-muted">
        Bought or were given a piece someone else registered? Ask them to release it in Grainward — they get a new code to hand to you, and the code on the drawer card stops working.
      </p>
    </>
  );
}
