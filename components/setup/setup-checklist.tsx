import Link from "next/link";
import { ButtonLink } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { SpriteIcon } from "@/components/ui/sprite-icon";
import type { SetupItem } from "@/lib/studio/setup";

/** The overview's "what is left to set up" (lib/studio/setup.ts), until every item is done; each item links to its step. */
export function SetupChecklist({ items }: { items: SetupItem[] }) {
  const done = items.filter((i) => i.done).length;
  const next = items.find((i) => !i.done);
  if (!next) return null;
  return (
    <section aria-labelledby="setup-h" className="mb-8">
      <Card className="space-y-3">
        <div>
          <h2 id="setup-h" className="font-display text-xl font-semibold">
            Finish setting up your studio
          </h2>
          <p className="text-sm text-muted">
            {done} of {items.length} done. Each step saves on its own; skip any and come back to it from this list.
          </p>
        </div>
        <ButtonLink href={next.href}>{done === 0 ? "Start the set-up" : `Continue the set-up: ${next.label}`}</ButtonLink>
        <ul className="divide-y divide-line">
          {items.map((i) => (
            <li key={i.key} className="flex items-start gap-3 py-2">
              {i.done ? (
                <SpriteIcon name="circle-check" className="mt-0.5 size-5 shrink-0 text-ok" />
              ) : (
                <SpriteIcon name="circle" className="mt-0.5 size-5 shrink-0 text-muted" />
              )}
              <div>
                {i.done ? (
                  <p className="font-medium">
                    {i.label} <span className="text-sm font-normal text-muted">(done)</span>
                  </p>
                ) : (
                  <Link href={i.href} className="font-medium text-resin underline underline-offset-2">
                    {i.label}
                  </Link>
                )}
                <p className="text-sm text-muted">{i.hint}</p>
              </div>
            </li>
          ))}
        </ul>
      </Card>
    </section>
  );
}
