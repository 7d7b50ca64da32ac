// Builds the message for one leased reminder: subject, the React Email element, and its headers.
import { createElement } from "react";
import type { TopShape } from "@/lib/care/area";
import type { Quote } from "@/lib/care/quote";
import type { CareTask, CatalogEntry } from "@/lib/care/schedule";
import type { ReminderStep, SunExposure, Use } from "@/lib/care/vocabulary";
import type { SendMailInput } from "@/lib/mail";
import { CareReminder, type CareReminderProps } from "@/emails/care-reminder";
import type { PlanOfferLine } from "@/emails/components/plan-offers";
import { cautionsFor, daysUntil, leadFor, longDate, offerView, quantityText, stepHeadline, subjectFor, SURFACE_WORDS, TASK_STEPS, whyNow } from "./content";
import { logCareUrl, offerUrl, pieceUrl, preferencesUrl, oneClickUnsubscribeUrl, unsubscribeHeaders } from "./tokens";

export interface ReminderMail {
  reminderKey: string;
  step: ReminderStep;
  task: CareTask;
  owner: { id: string; email: string; name: string; unitSystem: "metric" | "imperial" };
  piece: { id: string; title: string; use: Use; sun: SunExposure; shape: TopShape | undefined; hasResin: boolean };
  /** id: the studio the reminder is sent for (sendMail studioId). */
  /** country: ISO 3166-1 alpha-2, how money is written. */
  studio: { id?: string; name: string; country: string };
  product: CatalogEntry | undefined;
  offer?: { id: string; quote: Quote };
  /** The care plans that fit the piece, printed under the refresh offer (lib/plans/offers planLinesForMail). */
  plans?: PlanOfferLine[];
  /** The owner's calendar date when the message goes out (reminders can go out late). */
  ownerToday: string;
}

export function reminderProps(m: ReminderMail): CareReminderProps {
  const { task, owner, piece } = m;
  const days = daysUntil(m.ownerToday, task.dueOn);
  const surface = SURFACE_WORDS[task.surface];
  return {
    ownerName: owner.name,
    studioName: m.studio.name,
    pieceTitle: piece.title,
    step: m.step,
    headline: stepHeadline(m.step, task.label, task.dueOn, days),
    lead: leadFor(m.step, { pieceTitle: piece.title, taskLabel: task.label, surface, dueOn: task.dueOn }, days),
    taskLabel: task.label,
    surface,
    dueOn: longDate(task.dueOn),
    whyNow: whyNow(task, piece),
    steps: TASK_STEPS[task.kind],
    quantity: quantityText(task, piece.shape, m.product, owner.unitSystem),
    cautions: cautionsFor(task, piece, m.product?.name),
    pieceUrl: pieceUrl(piece.id),
    logUrl: logCareUrl(piece.id, task.key),
    preferencesUrl: preferencesUrl(owner.id),
    unsubscribeUrl: oneClickUnsubscribeUrl(owner.id),
    offer: m.offer ? { ...offerView(m.offer.quote, offerUrl(m.offer.id), owner.unitSystem, m.studio.country), plans: m.plans } : undefined,
  };
}

export function composeReminder(m: ReminderMail): SendMailInput {
  return {
    to: m.owner.email,
    subject: subjectFor(m.step, m.task.label, m.piece.title, m.task.dueOn, daysUntil(m.ownerToday, m.task.dueOn), m.task.surface),
    email: createElement(CareReminder, reminderProps(m)),
    studioId: m.studio.id,
    headers: {
      ...unsubscribeHeaders(m.owner.id),
      "X-Grainward-Reminder": m.reminderKey,
      ...(m.offer ? { "X-Grainward-Offer": m.offer.id } : {}),
    },
  };
}
