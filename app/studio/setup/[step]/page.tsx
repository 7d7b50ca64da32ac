import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import type { ReactNode } from "react";
import { PolicyEditor } from "@/components/settings/policy-editor";
import { ProfileForm } from "@/components/settings/profile-form";
import { ReminderTimingForm } from "@/components/settings/reminder-timing-form";
import { VisitRulesForm } from "@/components/settings/visit-rules-form";
import { BrandForm } from "@/components/setup/brand-form";
import { MailSenderForm } from "@/components/setup/mail-sender-form";
import { SetupStepList } from "@/components/setup/setup-step-list";
import { StartCatalogButton } from "@/components/setup/start-catalog-button";
import { StripeKeyForm } from "@/components/setup/stripe-key-form";
import { StripeWebhookForm } from "@/components/setup/stripe-webhook-form";
import { InviteForm } from "@/components/team/invite-form";
import { ButtonLink } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { Notice } from "@/components/ui/notice";
import { HoursEditor } from "@/components/visits/hours-editor";
import { requireAdmin } from "@/lib/auth/guards";
import { forPage } from "@/lib/auth/page";
import { listCatalog } from "@/lib/catalog";
import { formatInstant, zoneChoices } from "@/lib/format";
import { freshStudio, policyEditorValues, profileFormValues, reminderTiming, visitRules } from "@/lib/settings";
import { ACCENT_NAMES, ACCENTS, logoPath } from "@/lib/studio/brand";
import { SETUP_STEP_WORDS, isSetupStep, setupChecklist, type SetupStep } from "@/lib/studio/setup";
import { stripeAccountStatus } from "@/lib/studio/setup-payments";
import { mailSenderValues, warrantyStartValues } from "@/lib/studio/setup-steps";
import { listMembers, listOpenInvitations } from "@/lib/studio/team";
import { listTechnicians } from "@/lib/visits/technicians";
import { createPolicyVersionAction, saveProfileAction, saveReminderTimingAction, saveVisitRulesAction } from "../../settings/actions";
import { inviteAction } from "../../team/actions";
import { saveAccentAction, saveMailSenderAction, saveStripeKeyAction, saveStripeWebhookSecretAction, sendTestMessageAction, startCatalogAction } from "../actions";

type Props = { params: Promise<{ step: string }> };

export async function generateMetadata({ params }: Props): Promise<Metadata> {
  const { step } = await params;
  return { title: isSetupStep(step) ? `Set-up: ${SETUP_STEP_WORDS[step].label}` : "Set-up" };
}

const ROLE_WORDS = { admin: "Admin", staff: "Staff", technician: "Technician" } as const;

export default async function SetupStepPage({ params }: Props) {
  const { step } = await params;
  if (!isSetupStep(step)) notFound();
  const ctx = await forPage(requireAdmin);
  const items = setupChecklist(ctx);
  const at = items.findIndex((i) => i.key === step);
  const item = items[at]!;
  const next = items[at + 1];
  const prev = items[at - 1];

  return (
    <div className="grid gap-6 lg:grid-cols-[15rem_1fr]">
      <SetupStepList items={items} current={step} />
      <div className="min-w-0 space-y-4">
        <Card className="space-y-4">
          <div>
            <h2 className="font-display text-xl font-semibold">
              Step {at + 1} of {items.length}: {item.label}
            </h2>
            <p className="text-sm text-muted">{item.hint}</p>
            {item.done ? <p className="mt-1 text-sm font-medium text-ok">This step is done; you can still change it.</p> : null}
          </div>
          <StepBody step={step} ctx={ctx} />
        </Card>
        <div className="flex flex-wrap items-center justify-between gap-3">
          {prev ? (
            <Link href={prev.href} className="inline-flex min-h-11 items-center text-sm font-medium text-resin underline underline-offset-2">
              Back: {prev.label}
            </Link>
          ) : (
            <span />
          )}
          {next ? (
            <ButtonLink href={next.href} variant={item.done ? "primary" : "secondary"}>
              {item.done ? `Next: ${next.label}` : `Skip for now: ${next.label}`}
            </ButtonLink>
          ) : (
            <ButtonLink href="/studio">{item.done ? "Finish: go to the overview" : "Skip for now: go to the overview"}</ButtonLink>
          )}
        </div>
      </div>
    </div>
  );
}

type Ctx = Awaited<ReturnType<typeof requireAdmin>>;

function StepBody({ step, ctx }: { step: SetupStep; ctx: Ctx }): ReactNode {
  switch (step) {
    case "details":
      return <ProfileForm values={profileFormValues(ctx)} timeZones={zoneChoices([ctx.studio.timeZone])} action={saveProfileAction} guessTimeZone submitLabel="Save studio details" />;
    case "brand": {
      const s = freshStudio(ctx);
      return <BrandForm studioName={s.name} logoUrl={logoPath(s)} accent={s.accent} accents={ACCENT_NAMES.map((name) => ({ name, ...ACCENTS[name] }))} action={saveAccentAction} />;
    }
    case "warranty": {
      const editor = policyEditorValues(ctx);
      const start = warrantyStartValues(ctx, editor.latestVersion ? editor.values : null);
      return (
        <>
          {start.fromTemplate ? (
            <Notice tone="warn" title="A template: review before use">
              These terms are a starting point we wrote, not advice for your studio. Read every line, change what does not fit your work and your local consumer law, then save.
            </Notice>
          ) : (
            <p className="text-sm text-muted">Your warranty terms are saved. Saving again makes new terms for later deliveries; every set you saved is listed in Settings.</p>
          )}
          <PolicyEditor values={start.values} earliest={editor.earliest} latestVersion={editor.latestVersion} action={createPolicyVersionAction} />
        </>
      );
    }
    case "catalog": {
      const products = listCatalog(ctx, { includeArchived: false });
      return products.length ? (
        <>
          <ul className="list-disc space-y-1 pl-5 text-sm">
            {products.map((p) => (
              <li key={p.id}>{p.name}</li>
            ))}
          </ul>
          <p className="text-sm">
            <Link href="/studio/catalog" className="font-medium text-resin underline underline-offset-2">
              Open the finish catalog
            </Link>{" "}
            to add your own products and change coverage, intervals and safety notes.
          </p>
        </>
      ) : (
        <>
          <p className="text-sm">Start with one entry for each kind of finish, with starting values you then check against the maker&apos;s data sheet, or add your own products on the catalog page.</p>
          <StartCatalogButton action={startCatalogAction} />
          <p className="text-sm">
            <Link href="/studio/catalog" className="font-medium text-resin underline underline-offset-2">
              Add products yourself on the catalog page
            </Link>
          </p>
        </>
      );
    }
    case "reminders":
      return (
        <>
          <p className="text-sm text-muted">Owners get up to three e-mails per care task: 14 days before it is due, on the day, and 30 days after if no care was logged. The hour is the owner&apos;s local time.</p>
          <ReminderTimingForm values={reminderTiming(ctx)} action={saveReminderTimingAction} />
        </>
      );
    case "visits": {
      const techs = listTechnicians(ctx);
      return (
        <>
          <VisitRulesForm values={visitRules(ctx)} action={saveVisitRulesAction} />
          <section aria-labelledby="hours-h" className="space-y-3 border-t border-line pt-4">
            <h3 id="hours-h" className="font-semibold">
              Technicians&apos; hours
            </h3>
            {techs.length === 0 ? (
              <p className="text-sm text-muted">No technicians yet. Invite one in the team step; once they have joined, set their weekly hours here or on the Working hours page.</p>
            ) : (
              techs.map((t) => (
                <div key={t.id} className="space-y-2">
                  <h4 className="font-medium">{t.name}</h4>
                  <HoursEditor technicianId={t.id} name={t.name} initial={{ hours: t.hours, timeOff: t.timeOff }} editable />
                </div>
              ))
            )}
          </section>
        </>
      );
    }
    case "team": {
      const members = listMembers(ctx);
      const invites = listOpenInvitations(ctx);
      return (
        <>
          <InviteForm action={inviteAction} />
          <div className="text-sm">
            <h3 className="font-semibold">In the studio</h3>
            <ul className="list-disc pl-5">
              {members.map((m) => (
                <li key={m.id}>
                  {m.name} ({ROLE_WORDS[m.role]})
                </li>
              ))}
              {invites.map((i) => (
                <li key={i.id}>
                  {i.email} ({ROLE_WORDS[i.role]}, invited until {formatInstant(i.expiresAt, ctx.studio.timeZone, { time: true })})
                </li>
              ))}
            </ul>
            <p className="mt-2 text-muted">
              Change roles or withdraw invitations on the{" "}
              <Link href="/studio/team" className="font-medium text-resin underline underline-offset-2">
                Team page
              </Link>
              .
            </p>
          </div>
        </>
      );
    }
    case "payments": {
      const status = stripeAccountStatus(ctx);
      return (
        <>
          {status.keyEnding && status.checkedAt ? (
            <Notice tone="ok">
              Your key ending {status.keyEnding} is saved; Stripe accepted it on {formatInstant(status.checkedAt, ctx.studio.timeZone, { time: true })}. Owners now pay into your own Stripe account. Paste a new key to replace it.
            </Notice>
          ) : (
            <p className="text-sm">Until you save a key, owners pay through this installation&apos;s Stripe account.</p>
          )}
          <StripeKeyForm action={saveStripeKeyAction} />
          {status.keyEnding ? (
            <>
              {status.webhookSecretEnding ? <Notice tone="ok">A signing secret ending {status.webhookSecretEnding} is saved. Paste a new one to replace it.</Notice> : null}
              <StripeWebhookForm action={saveStripeWebhookSecretAction} endpoint={status.webhookUrl} />
            </>
          ) : null}
          <p className="text-sm">
            Owners pay repair quotes priced from your{" "}
            <Link href="/studio/settings/repairs" className="font-medium text-resin underline underline-offset-2">
              repair prices and tax
            </Link>
            .
          </p>
        </>
      );
    }
    case "mail":
      return <MailSenderForm values={mailSenderValues(ctx)} yourEmail={ctx.user.email} action={saveMailSenderAction} sendTest={sendTestMessageAction} />;
  }
}
