import { ButtonLink } from "@/components/ui/button";

export default function NotFound() {
  return (
    <main className="mx-auto max-w-md space-y-4 px-4 py-20 text-center">
      <p className="font-display text-5xl font-semibold text-resin">404</p>
      <h1 className="text-xl font-semibold">We couldn&apos;t find that page</h1>
      <p className="text-muted">The link may be old, or the page may belong to another account.</p>
      <ButtonLink href="/home">Go to my start page</ButtonLink>
    </main>
  );
}
