"use client";

import { useState } from "react";
import { useFieldArray, useForm, type FieldPath } from "react-hook-form";
import { toast } from "sonner";
import { apiJson, isApiError } from "@/components/api-client";
import { useRefreshingMutation } from "@/components/forms/use-refreshing-mutation";
import { Button } from "@/components/ui/button";
import { ErrorLine } from "@/components/ui/error-line";
import { SelectField, TextField } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import { formatMinorUnits } from "@/lib/care/quote";
import { formatAndList, formatMoney } from "@/lib/format";
import { M2_PER_FT2 } from "@/lib/care/units";
import { CARE_TASK_KINDS, CARE_TASK_LABELS, SURFACE_LABELS, type Surface } from "@/lib/care/vocabulary";
import { useReportQuoteDraft } from "@/components/jobs/quote-draft";
import { LINE_KIND_LABELS, LINE_KINDS, LINE_SOURCE_LABELS, LINE_UNIT_LABELS, LINE_UNITS, parseMajorAmount, type LineDraft } from "@/lib/repairs/lines";
import { reproposeLines } from "@/lib/repairs/repropose";

type Product = { id: string; name: string; finishClassLabel: string };
type Repair = { key: string; label: string };
export type BuilderLine = LineDraft & { proposed: { quantity: number; unitPriceMinor: number } | null };
export type BuilderInitial = {
  title: string;
  tasks: string[];
  repairs: string[];
  productIds: string[];
  coats: number;
  travel: boolean;
  coveredPct: number;
  notes: string;
  areasM2?: Partial<Record<Surface, number>>;
  /** By task, the surfaces besides the top priced too (lib/validation/jobs.ts alsoSurfaces). */
  alsoSurfaces?: Partial<Record<string, Surface[]>>;
};
/** A task whose finish ends the top and other surfaces, in words, with a choice for each other surface ("Also price the base (6.5 ft²)"). */
export type TopOnlyChoice = { task: string; words: string; choices: { surface: Surface; label: string }[] };

const QUANTITY = /^\s*\d{1,6}(\.\d{1,3})?\s*$/;
/** Two form lines alike in everything staff can change. */
const sameLine = (a: FormLine, b: FormLine) => a.description === b.description && a.quantity === b.quantity && a.unit === b.unit && a.unitPrice === b.unitPrice && a.kind === b.kind;
/** What the last proposal did to a proposed line: kept staff's quantity and price, or changed them from these. */
type LineMark = { was: "kept" } | { was: "changed"; quantity: number; unitPriceMinor: number };
/** A checkbox group reads as a list whether one box or several exist. */
const list = (x: unknown): string[] => (Array.isArray(x) ? x : typeof x === "string" ? [x] : []);

type FormLine = Omit<BuilderLine, "quantity" | "unitPriceMinor"> & { quantity: string; unitPrice: string };
type FormValues = Omit<BuilderInitial, "coats" | "coveredPct" | "areasM2" | "alsoSurfaces"> & {
  coats: string;
  coveredPct: string;
  lines: FormLine[];
  areas: Partial<Record<Surface, string>>;
  /** By task, the "Also price the …" boxes ticked (a list, or one box's value or false). */
  also: Record<string, unknown>;
};
/** The fields the schema checks, above the lines and below them, in the order the form shows them. */
const ABOVE_LINES = ["title", "tasks", "coats"] as const;
const BELOW_LINES = ["coveredPct", "notes"] as const;

type QuoteBuilderProps = {
  jobId: string;
  initial: BuilderInitial;
  lines: BuilderLine[];
  products: Product[];
  repairs: Repair[];
  currency: string;
  country: string;
  exponent: number;
  editable: boolean;
  /** The covered percentage's label: whose share it is (coverWords in lib/repairs/states.ts). */
  coveredField: string;
  /** Work the proposal priced nothing for, its surface having no size on the piece's record, in words (lib/repairs/pricing unsizedWords). */
  unsized: string[];
  /** Work whose finish ends the top and other surfaces too, each other surface a box to price it as well (lib/repairs/pricing topOnlyWords). */
  topOnly: TopOnlyChoice[];
  /** The surfaces the record has no size for, whose area staff may type on this quote. */
  sizeFields: Surface[];
  units: "metric" | "imperial";
};

/** A surface's area in the studio's units, as the size field shows it and sends it back (m²). */
const areaUnit = (units: QuoteBuilderProps["units"]) => (units === "metric" ? { label: "m²", perM2: 1 } : { label: "ft²", perM2: 1 / M2_PER_FT2 });

/**
 * The quote builder: maintenance tasks and repairs the care engine and the price list propose lines
 * from ("Propose lines"), then every line's description, quantity and unit price editable, typed lines
 * added ("Save the quote"). The server prices what is saved; totals are never computed here.
 */
export function QuoteBuilder({
  jobId,
  initial,
  lines,
  products,
  repairs,
  currency,
  country,
  exponent,
  editable,
  coveredField,
  unsized,
  topOnly,
  sizeFields,
  units,
}: QuoteBuilderProps) {
  const unit = areaUnit(units);
  const typedAreas = Object.fromEntries(Object.entries(initial.areasM2 ?? {}).map(([s, m2]) => [s, String(Number((m2 * unit.perM2).toFixed(2)))]));
  const [formError, setFormError] = useState<string | null>(null);
  // After a proposal, by ref: the lines that kept staff's quantity and price, and those the proposal changed (with what they were).
  const [marks, setMarks] = useState<Record<string, LineMark>>({});
  const toForm = (l: BuilderLine): FormLine => ({ ...l, quantity: String(l.quantity), unitPrice: formatMinorUnits(l.unitPriceMinor, currency) });
  const { alsoSurfaces, ...rest } = initial;
  const form = useForm<FormValues>({ defaultValues: { ...rest, coats: String(initial.coats), coveredPct: String(initial.coveredPct), lines: lines.map(toForm), areas: typedAreas, also: { ...alsoSurfaces } } });
  const { register, handleSubmit, formState, control, setError, setFocus } = form;
  useReportQuoteDraft(editable && formState.isDirty);
  const fields = useFieldArray({ control, name: "lines" });
  const { run, busy } = useRefreshingMutation(
    ({ body }: { body: Record<string, unknown> & { alsoSurfaces: Record<string, string[]> }; v: FormValues; withLines: boolean }) => apiJson<{ job: { lines: BuilderLine[] } }>(`/api/jobs/${jobId}`, { method: "PATCH", json: body }),
    {
      onSuccess: ({ job }, { body, v, withLines }) => {
        const saved = job.lines.map(toForm);
        // The boxes as saved: a task cleared since drops its choice, so ticking it again starts from the top alone.
        form.reset({ ...v, also: body.alsoSurfaces, lines: saved });
        if (withLines) {
          setMarks({});
          return void toast.success("Quote saved.");
        }
        // Proposing sends no lines: the server lays the proposal over the lines last saved. Here it is laid
        // over the form's lines as they stand (lib/repairs/repropose.ts, the server's rule), so a quantity or
        // price changed since and not saved stays too, as typed lines added or changed here do (unsaved, so
        // the quote can't be sent before they are).
        const fresh = job.lines.filter((l) => l.source !== "typed").map((l) => ({ ...l, quantity: l.proposed?.quantity ?? l.quantity, unitPriceMinor: l.proposed?.unitPriceMinor ?? l.unitPriceMinor }));
        const before = v.lines.map((l) => ({ ...l, quantity: Number(l.quantity), unitPriceMinor: parseMajorAmount(l.unitPrice, exponent) ?? Number.NaN }));
        const merged = reproposeLines(before, fresh);
        const proposedLines = merged.map(({ line, was }) => {
          const mine = was === "kept" ? v.lines.find((l) => l.source !== "typed" && l.ref === line.ref) : undefined;
          // A kept line keeps what staff typed in its two fields, as typed; the rest is the proposal's.
          return mine ? { ...toForm(line), quantity: mine.quantity, unitPrice: mine.unitPrice } : toForm(line);
        });
        setMarks(Object.fromEntries(merged.flatMap(({ line, was, before: b }): [string, LineMark][] => (was === "kept" ? [[line.ref!, { was }]] : was === "changed" && b ? [[line.ref!, { was, quantity: b.quantity, unitPriceMinor: b.unitPriceMinor }]] : []))));
        const next = [...proposedLines, ...v.lines.filter((l) => l.source === "typed")];
        const same = next.length === saved.length && next.every((l, i) => sameLine(l, saved[i]!));
        if (!same) fields.replace(next);
        const kept = merged.some((m) => m.was === "kept");
        const typed = v.lines.filter((l) => l.source === "typed");
        const savedTyped = saved.filter((l) => l.source === "typed");
        const typedSame = typed.length === savedTyped.length && typed.every((l, i) => sameLine(l, savedTyped[i]!));
        const keptWords = [typedSame ? "" : "Your typed lines are kept", kept ? "Lines you changed keep your quantity and price" : ""].filter(Boolean).join(". ");
        toast.success(
          same
            ? `Lines proposed from the tasks. ${kept ? "Lines you changed keep your quantity and price." : "Change hours or quantities, then save."}`
            : `Lines proposed from the tasks. ${keptWords || "Your changes are kept"}: save the quote to keep them.`,
        );
      },
      onError: (words, e, { v }) => {
        if (!isApiError(e)) return setFormError(words);
        setFormError([e.message, ...(e.fieldErrors.lines ?? [])].join(" "));
        for (const [field, msgs] of Object.entries(e.fieldErrors)) {
          if (field !== "lines" && msgs[0] && field in v) setError(field as keyof FormValues, { message: msgs[0] });
        }
      },
    },
  );
  const saving = busy || formState.isSubmitting;

  const submit = (withLines: boolean) =>
    handleSubmit(async (v) => {
      setFormError(null);
      const badLines: FieldPath<FormValues>[] = [];
      const wrong = (field: `lines.${number}.${"description" | "quantity" | "unitPrice"}`, message: string) => {
        badLines.push(field);
        setError(field, { message });
      };
      const sent = v.lines.map((l, i) => {
        const unitPriceMinor = parseMajorAmount(l.unitPrice, exponent);
        if (!l.description.trim()) wrong(`lines.${i}.description`, "Describe the line.");
        if (!QUANTITY.test(l.quantity) || Number(l.quantity) <= 0) wrong(`lines.${i}.quantity`, "A number above 0 and up to 100,000, at most three decimals (0.75).");
        if (unitPriceMinor === null) wrong(`lines.${i}.unitPrice`, `Enter a price like ${formatMinorUnits(8550, currency)}.`);
        const { unitPrice: _p, proposed: _x, ...rest } = l;
        return { ...rest, quantity: l.quantity.trim(), unitPriceMinor: unitPriceMinor ?? 0 };
      });
      // Sizes typed in the studio's units go to the server in m² (an empty field: no size).
      const areasM2 = Object.fromEntries(sizeFields.flatMap((s) => (v.areas?.[s]?.trim() ? [[s, Number(v.areas[s]) / unit.perM2]] : [])));
      // The surfaces priced besides the top, for the tasks still chosen, among those the note offers.
      const tasks = list(v.tasks);
      const alsoSurfaces = Object.fromEntries(topOnly.filter((w) => tasks.includes(w.task)).map((w) => [w.task, list(v.also?.[w.task]).filter((s) => w.choices.some((c) => c.surface === s))]));
      const body = { title: v.title, notes: v.notes, tasks, repairs: list(v.repairs), productIds: list(v.productIds), coats: v.coats, travel: v.travel, coveredPct: v.coveredPct, areasM2, alsoSurfaces, ...(withLines ? { lines: sent } : {}) };
      // The server's own schema, checked on the same press: every field's problem shows at once, the first focused.
      const problems = (await import("@/lib/validation/jobs")).quoteProblems(body);
      const badArea = sizeFields.find((s) => problems[`areasM2.${s}`]);
      for (const s of sizeFields) if (problems[`areasM2.${s}`]) setError(`areas.${s}`, { message: problems[`areasM2.${s}`] });
      if (badArea) return setFocus(`areas.${badArea}`);
      const [above, below] = [ABOVE_LINES.filter((f) => problems[f]), BELOW_LINES.filter((f) => problems[f])];
      for (const f of [...above, ...below]) setError(f, { message: problems[f] });
      const first = [...above, ...(withLines ? badLines : []), ...below][0];
      if (first) return setFocus(first);
      run({ body, v, withLines });
    });

  // A closed quote shows what was quoted, with no controls that could not act (lib/repairs/states.ts QUOTE_EDITABLE).
  if (!editable) return <ClosedQuote initial={initial} lines={lines} products={products} repairs={repairs} currency={currency} country={country} coveredField={coveredField} />;

  const lineErrors = formState.errors.lines;
  return (
    <form onSubmit={submit(true)} noValidate className="space-y-5">
      {formError ? <Notice tone="error">{formError}</Notice> : null}
      {/* Disabled while the quote is sent, not while the press is checked: the first field to fix takes the focus (the buttons stay disabled throughout). */}
      <fieldset disabled={busy} className="space-y-5">
        <TextField label="Job title" {...register("title")} error={formState.errors.title?.message} />

        {unsized.length ? (
          <Notice tone="warn" title="Some work has no size to price it from">
            <ul className="list-disc space-y-1 pl-5">
              {unsized.map((words) => (
                <li key={words}>{words}</li>
              ))}
            </ul>
            <p className="mt-1">Type its area under “What the lines are proposed from” and press “Propose lines”, or add typed lines with the hours and amounts.</p>
          </Notice>
        ) : null}

        {topOnly.length ? (
          <Notice title="This finish is on more than the top">
            <ul className="space-y-3">
              {topOnly.map((w) => (
                <li key={w.task} className="space-y-2">
                  <p>{w.words}</p>
                  {w.choices.map((c) => (
                    <label key={c.surface} className="flex min-h-11 items-center gap-2 rounded-lg border border-line bg-white px-3">
                      {/* Ticking proposes the lines again at once, so the lines and the choice never disagree. */}
                      <input type="checkbox" value={c.surface} {...register(`also.${w.task}`, { onChange: () => void submit(false)() })} className="size-4" />
                      {c.label}
                    </label>
                  ))}
                </li>
              ))}
            </ul>
            <p className="mt-2">Ticking or clearing a box proposes the lines again: a proposed line whose quantity or price you changed keeps your change, and lines you typed yourself stay.</p>
          </Notice>
        ) : null}

        <details className="rounded-lg border border-line bg-white p-3" open={lines.length === 0 || unsized.length > 0 || Boolean(formState.errors.tasks ?? formState.errors.coats ?? formState.errors.areas)}>
          <summary className="cursor-pointer font-medium">What the lines are proposed from</summary>
          <div className="mt-3 space-y-4">
            <fieldset className="space-y-2">
              <legend className="text-sm font-medium">Repairs (from your price list)</legend>
              <div className="grid gap-2 sm:grid-cols-2">
                {repairs.map((r) => (
                  <label key={r.key} className="flex min-h-11 items-center gap-2 rounded-lg border border-line bg-white px-3">
                    <input type="checkbox" value={r.key} {...register("repairs")} className="size-4" />
                    {r.label}
                  </label>
                ))}
              </div>
            </fieldset>
            <fieldset className="space-y-2">
              <legend className="text-sm font-medium">Maintenance</legend>
              <div className="grid gap-2 sm:grid-cols-2">
                {CARE_TASK_KINDS.map((k) => (
                  <label key={k} className="flex min-h-11 items-center gap-2 rounded-lg border border-line bg-white px-3">
                    <input type="checkbox" value={k} {...register("tasks")} className="size-4" />
                    {CARE_TASK_LABELS[k]}
                  </label>
                ))}
              </div>
              <ErrorLine>{formState.errors.tasks?.message}</ErrorLine>
            </fieldset>
            <fieldset className="space-y-2">
              <legend className="text-sm font-medium">Products from the catalog</legend>
              {products.length === 0 ? <p className="text-sm text-muted">The catalog has no products yet.</p> : null}
              <div className="grid gap-2 sm:grid-cols-2">
                {products.map((p) => (
                  <label key={p.id} className="flex min-h-11 items-center gap-2 rounded-lg border border-line bg-white px-3">
                    <input type="checkbox" value={p.id} {...register("productIds")} className="size-4" />
                    <span>
                      {p.name} <span className="text-sm text-muted">· {p.finishClassLabel}</span>
                    </span>
                  </label>
                ))}
              </div>
            </fieldset>
            <div className="grid gap-4 sm:grid-cols-2">
              <TextField label="Coats" type="number" min={1} max={6} {...register("coats")} error={formState.errors.coats?.message} />
              <label className="flex min-h-11 items-center gap-2 self-end rounded-lg border border-line bg-white px-3">
                <input type="checkbox" {...register("travel")} className="size-4" />
                Charge the travel fee
              </label>
            </div>
            {sizeFields.length ? (
              <div className="grid gap-4 sm:grid-cols-2">
                {sizeFields.map((s) => (
                  <TextField
                    key={s}
                    label={`${SURFACE_LABELS[s]} area for this quote (${unit.label})`}
                    hint={`Optional: one face, for work on the ${SURFACE_LABELS[s].toLowerCase()}. The piece's record has no size for it.`}
                    inputMode="decimal"
                    {...register(`areas.${s}`)}
                    error={formState.errors.areas?.[s]?.message}
                  />
                ))}
              </div>
            ) : null}
            <Button type="button" variant="secondary" disabled={saving} onClick={submit(false)}>
              Propose lines
            </Button>
            <p className="text-sm text-muted">Proposing replaces the proposed lines with fresh ones, keeping the quantity and price you changed on a line proposed again (remove the line first to take the proposal&apos;s); lines you typed yourself stay.</p>
          </div>
        </details>

        <fieldset className="space-y-3">
          <legend className="text-sm font-medium">Lines</legend>
          {fields.fields.length === 0 ? <p className="text-sm text-muted">No lines yet. Propose them from the work above, or add a line.</p> : null}
          <ol className="space-y-3">
            {fields.fields.map((f, i) => (
              <li key={f.id} className="space-y-3 rounded-lg border border-line bg-white p-3">
                <div className="flex flex-wrap items-center justify-between gap-2 text-xs text-muted">
                  <span>
                    {LINE_SOURCE_LABELS[f.source]}
                    {f.proposed ? ` · proposed ${f.proposed.quantity} ${LINE_UNIT_LABELS[f.unit]} at ${formatMoney(f.proposed.unitPriceMinor, currency, country)}` : ""}
                    {(() => {
                      const mark = f.ref ? marks[f.ref] : undefined;
                      if (!mark) return null;
                      return mark.was === "kept" ? (
                        <span className="block font-medium text-ink">Your quantity and price kept</span>
                      ) : (
                        <span className="block font-medium text-ink">Changed by the proposal from {mark.quantity} {LINE_UNIT_LABELS[f.unit]} at {formatMoney(mark.unitPriceMinor, currency, country)}</span>
                      );
                    })()}
                  </span>
                  <Button type="button" variant="secondary" onClick={() => fields.remove(i)} aria-label={`Remove line ${i + 1}`}>
                    Remove
                  </Button>
                </div>
                <TextField label={`Line ${i + 1}: description`} {...register(`lines.${i}.description`)} error={lineErrors?.[i]?.description?.message} />
                {/* Two columns, not four: at four the quote card (3/5 of a 1280 px page) cut 'Delivery and travel' to 'Delivery and'. */}
                <div className="grid gap-3 sm:grid-cols-2">
                  <TextField label="Quantity" inputMode="decimal" {...register(`lines.${i}.quantity`)} error={lineErrors?.[i]?.quantity?.message} />
                  <SelectField label="Unit" {...register(`lines.${i}.unit`)}>
                    {LINE_UNITS.map((u) => (
                      <option key={u} value={u}>
                        {LINE_UNIT_LABELS[u]}
                      </option>
                    ))}
                  </SelectField>
                  <TextField label={`Unit price (${currency})`} inputMode="decimal" {...register(`lines.${i}.unitPrice`)} error={lineErrors?.[i]?.unitPrice?.message} />
                  <SelectField label="Kind (for tax)" {...register(`lines.${i}.kind`)}>
                    {LINE_KINDS.map((k) => (
                      <option key={k} value={k}>
                        {LINE_KIND_LABELS[k]}
                      </option>
                    ))}
                  </SelectField>
                </div>
              </li>
            ))}
          </ol>
          <Button
            type="button"
            variant="secondary"
            onClick={() => fields.append({ kind: "other", source: "typed", description: "", quantity: "1", unit: "each", unitPrice: "", proposed: null })}
          >
            Add a typed line
          </Button>
        </fieldset>

        <TextField label={coveredField} type="number" min={0} max={100} {...register("coveredPct")} error={formState.errors.coveredPct?.message} />
        <label className="block space-y-1.5">
          <span className="text-sm font-medium">Notes for the technician</span>
          <textarea rows={3} {...register("notes")} className="block w-full rounded-lg border border-line bg-white px-3 py-2" />
        </label>
        <Button type="submit" disabled={saving}>
          {saving ? "Saving…" : "Save the quote"}
        </Button>
      </fieldset>
    </form>
  );
}

/** The quote of a job past approval, read only: the same facts the builder edits, as text. */
function ClosedQuote({
  initial,
  lines,
  products,
  repairs,
  currency,
  country,
  coveredField,
}: Omit<QuoteBuilderProps, "jobId" | "exponent" | "editable" | "unsized" | "topOnly" | "sizeFields" | "units">) {
  const from = [
    ...repairs.filter((r) => initial.repairs.includes(r.key)).map((r) => r.label),
    // A task priced on other surfaces beside the top names them: "Re-wax (top and base)".
    ...initial.tasks
      .filter((t): t is keyof typeof CARE_TASK_LABELS => t in CARE_TASK_LABELS)
      .map((t) => (initial.alsoSurfaces?.[t]?.length ? `${CARE_TASK_LABELS[t]} (${formatAndList(["top", ...initial.alsoSurfaces[t]!].map((s) => SURFACE_LABELS[s as Surface].toLowerCase()))})` : CARE_TASK_LABELS[t])),
    ...products.filter((p) => initial.productIds.includes(p.id)).map((p) => `${p.name} (${p.finishClassLabel})`),
  ];
  return (
    <div className="space-y-4 text-sm">
      <p className="text-muted">This quote can no longer be changed.</p>
      <dl className="grid gap-x-4 gap-y-2 sm:grid-cols-[auto_1fr]">
        <dt className="font-medium">Job title</dt>
        <dd>{initial.title}</dd>
        <dt className="font-medium">Proposed from</dt>
        <dd>{from.length ? from.join(" · ") : "Typed lines only"}{initial.travel ? " · travel fee" : ""}</dd>
        <dt className="font-medium">{coveredField}</dt>
        <dd>{initial.coveredPct}%</dd>
        {initial.notes ? (
          <>
            <dt className="font-medium">Notes for the technician</dt>
            <dd className="whitespace-pre-line">{initial.notes}</dd>
          </>
        ) : null}
      </dl>
      <h3 className="font-medium">Lines</h3>
      {lines.length === 0 ? <p className="text-muted">No lines.</p> : null}
      <ol className="space-y-2">
        {lines.map((l, i) => (
          <li key={i} className="rounded-lg border border-line bg-white p-3">
            <p>{l.description}</p>
            <p className="text-xs text-muted">
              {l.quantity} {LINE_UNIT_LABELS[l.unit]} at {formatMoney(l.unitPriceMinor, currency, country)} · {LINE_KIND_LABELS[l.kind]} · {LINE_SOURCE_LABELS[l.source]}
            </p>
          </li>
        ))}
      </ol>
    </div>
  );
}
