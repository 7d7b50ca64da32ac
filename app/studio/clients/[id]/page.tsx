import type { Metadata } from "next";
import Link from "next/link";
import { ClientForm } from "@/components/clients/client-form";
import { ClientTimeline } from "@/components/clients/client-timeline";
import { ConsentForm } from "@/components/clients/consent-form";
import { PersonalDataCard } from "@/components/clients/personal-data-card";
import { formatDate, formatInstant, zoneChoices } from "@/lib/format";
import { Card, PageHeader } from "@/components/ui/card";
import { requireStaff } from "@/lib/auth/guards";
import { forPage } from "@/lib/auth/page";
import { PIECE_KIND_LABELS } from "@/lib/care/vocabulary";
import { getClient } from "@/lib/clients/get";
import { ERASED_NAME } from "@/lib/clients/personal-data";
import { CONSENT_KIND_LABELS, CONSENT_KIND_NAMES, CONSENT_SOURCE_LABELS, CONTACT_METHOD_LABELS } from "@/lib/clients/vocabulary";
import { ClientPlansSection } from "@/app/studio/plans/client-plans-section";

export const metadata: Metadata = { title: "Client" };
export const dynamic = "force-dynamic";

export default async function StudioClientPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const { ctx, detail } = await forPage(async () => {
    const ctx = await requireStaff();
    return { ctx, detail: getClient(ctx, id) };
  });
  const { client, consentHistory, pieces } = detail;
  const studioZone = ctx.studio.timeZone;
  const reach = [client.email, client.phoneDisplay].filter(Boolean).join(" · ");
  return (
    <div className="space-y-6">
      <p className="text-sm">
        <Link href="/studio/clients" className="inline-flex min-h-11 items-center text-resin underline">
          All clients
        </Link>
      </p>
      <PageHeader
        title={client.name}
        lead={`${reach || "No e-mail or phone yet"} · prefers ${CONTACT_METHOD_LABELS[client.preferredContact].toLowerCase()}${client.account ? " · has a Grainward account" : " · no Grainward account"}`}
      />
      <div className="grid gap-6 lg:grid-cols-[minmax(0,3fr)_minmax(0,2fr)]">
        <div className="space-y-6">
          <Card className="space-y-3">
            <h2 className="font-display text-xl font-semibold">Contact details</h2>
            <ClientForm client={client} studioZone={studioZone} zones={zoneChoices([studioZone, client.timeZone])} />
          </Card>
          <ClientTimeline clientId={client.id} />
        </div>
        <div className="space-y-6">
          <Card className="space-y-3">
            <h2 className="font-display text-xl font-semibold">Their pieces</h2>
            {pieces.length === 0 ? (
              <p className="text-muted">No pieces yet. A piece is theirs once you record it with them as the buyer, or once they register it with its drawer card.</p>
            ) : (
              <ul className="divide-y divide-line">
                {pieces.map((p) => (
                  <li key={p.id} className="py-2">
                    <Link href={`/studio/pieces/${p.id}`} className="font-medium text-resin underline underline-offset-2">
                      {p.title}
                    </Link>
                    <p className="text-sm text-muted">
                      {PIECE_KIND_LABELS[p.kind]} · delivered {formatDate(p.deliveredOn)} · {p.registered ? "registered" : "not registered yet"}
                      {p.archived ? " · archived" : ""}
                    </p>
                  </li>
                ))}
              </ul>
            )}
            <Link href={`/studio/pieces/new?client=${client.id}`} className="inline-flex min-h-11 items-center text-sm font-medium text-resin underline">
              Record a piece they bought
            </Link>
          </Card>
          <ClientPlansSection ctx={ctx} pieceIds={pieces.map((p) => p.id)} />
          <Card className="space-y-3">
            <h2 className="font-display text-xl font-semibold">Consent</h2>
            <dl className="space-y-1 text-sm">
              {(["service", "offers"] as const).map((k) => (
                <div key={k} className="flex justify-between gap-3">
                  <dt>{CONSENT_KIND_LABELS[k]}</dt>
                  <dd className="font-semibold">{(k === "service" ? client.consentService : client.consentOffers) ? "Agreed" : "Not agreed"}</dd>
                </div>
              ))}
            </dl>
            {consentHistory.length ? (
              <ol className="space-y-2 border-t border-line pt-3 text-sm" aria-label="Consent history, newest first">
                {consentHistory.map((h) => (
                  <li key={h.id}>
                    <p>
                      <span className="font-medium">{h.granted ? "Agreed to" : "Withdrew"}</span> {CONSENT_KIND_NAMES[h.kind].toLowerCase()} —{" "}
                      {/* Only the first letter: the label goes mid-sentence, and "Grainward" keeps its capital. */}
                      {CONSENT_SOURCE_LABELS[h.source].replace(/^./, (c) => c.toLowerCase())}, {formatInstant(h.givenAt, studioZone, { time: true })}
                    </p>
                    {h.note || h.recordedBy ? (
                      <p className="text-muted">
                        {h.note}
                        {h.note && h.recordedBy ? " · " : ""}
                        {h.recordedBy ? `recorded by ${h.recordedBy}` : ""}
                      </p>
                    ) : null}
                  </li>
                ))}
              </ol>
            ) : (
              <p className="text-sm text-muted">Nothing recorded yet.</p>
            )}
            <div className="border-t border-line pt-3">
              <ConsentForm clientId={client.id} current={{ service: client.consentService, offers: client.consentOffers }} today={detail.studioToday} />
            </div>
          </Card>
          {ctx.role === "admin" ? <PersonalDataCard clientId={client.id} name={client.name} erased={client.name === ERASED_NAME && !client.email && !client.phone} /> : null}
        </div>
      </div>
    </div>
  );
}
