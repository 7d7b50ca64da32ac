"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { toast } from "sonner";
import { apiJson, isApiError } from "@/components/api-client";
import { Button } from "@/components/ui/button";
import { Notice } from "@/components/ui/notice";
import { SpriteIcon } from "@/components/ui/sprite-icon";
import type { ImportResult } from "@/lib/pieces/csv";

async function send(csv: string, commit: boolean, sendHandover = false): Promise<ImportResult | { message: string }> {
  try {
    return await apiJson<ImportResult>("/api/pieces/import", { method: "POST", json: { csv, commit, sendHandover } });
  } catch (e) {
    if (!isApiError(e)) throw e;
    // Rows with problems come back with a 4xx and the checked rows, shown row by row.
    if ("rows" in e.body) return e.body as ImportResult;
    return { message: e.message };
  }
}

/** Import of earlier deliveries: preview first, per-row errors, and nothing written unless every row is valid. */
export function CsvImport({ columns }: { columns: readonly string[] }) {
  const router = useRouter();
  const [csv, setCsv] = useState<string | null>(null);
  const [name, setName] = useState("");
  const [result, setResult] = useState<ImportResult | null>(null);
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState<null | "checking" | "importing">(null);
  const [mailBuyers, setMailBuyers] = useState(false);

  const pick = async (f: File | undefined) => {
    if (!f) return;
    setName(f.name);
    setResult(null);
    setError(null);
    const text = await f.text();
    setCsv(text);
    setBusy("checking");
    const r = await send(text, false);
    setBusy(null);
    if ("message" in r) setError(r.message);
    else setResult(r);
  };
  const commit = async () => {
    if (!csv) return;
    setBusy("importing");
    const r = await send(csv, true, mailBuyers);
    setBusy(null);
    if ("message" in r) return setError(r.message);
    setResult(r);
    if (r.committed) {
      toast.success(
        `${r.created} piece${r.created === 1 ? "" : "s"} imported.${r.handover ? ` Hand-over mail is going out to ${r.handover.total} buyer${r.handover.total === 1 ? "" : "s"}.` : ""}`,
      );
      router.push(r.handover ? `/studio/clients/hand-over?batch=${r.handover.batchId}` : "/studio/pieces?sort=created");
    }
  };

  const byRow = new Map<number, ImportResult["errors"]>();
  for (const e of result?.errors ?? []) byRow.set(e.row, [...(byRow.get(e.row) ?? []), e]);

  return (
    <div className="space-y-4">
      <div className="rounded-xl border border-line bg-card p-5 text-sm">
        <p>
          One piece per row, with a header row. Columns: <span className="font-mono text-xs">{columns.join(", ")}</span>. Lengths in mm, area in m², volume in mL, dates YYYY-MM-DD. Species by name or alias (“walnut”). The finish stack: layers separated by “;”, each{" "}
          <span className="font-mono text-xs">surface:class:coats:date[:product]</span>, e.g. <span className="font-mono text-xs">top:hardwax_oil:2:2024-05-01</span>. An export from the registry has the same columns.
        </p>
        <p className="mt-2">
          Buyers (optional): <span className="font-mono text-xs">buyer_name, buyer_email, buyer_phone, buyer_service_mail_on</span> (the day they agreed to service mail). A buyer already among your clients is matched by e-mail, then phone; nobody is added twice.
        </p>
        <label className="mt-4 inline-flex min-h-11 cursor-pointer items-center gap-2 rounded-lg bg-resin px-4 font-semibold text-white hover:bg-resin-dark">
          <SpriteIcon name="upload" className="size-4" /> Choose a CSV file
          <input type="file" accept=".csv,text/csv" className="sr-only" onChange={(e) => pick(e.target.files?.[0])} />
        </label>
        {name ? <span className="ml-3 text-muted">{name}</span> : null}
      </div>
      {busy ? (
        <p role="status" className="text-sm text-muted">
          {busy === "checking" ? "Checking every row…" : "Importing in one transaction…"}
        </p>
      ) : null}
      {error ? <Notice tone="error">{error}</Notice> : null}
      {result ? (
        result.ok ? (
          <Notice tone="ok" title={`All ${result.rows.length} rows are valid`}>
            Nothing is written until you import.
          </Notice>
        ) : (
          <Notice tone="error" title={`${result.errors.length} problem${result.errors.length === 1 ? "" : "s"} found — nothing will be imported`}>
            Fix the rows below in the spreadsheet and choose the file again; no piece is written unless the whole file is valid.
            {result.errors.filter((e) => e.row <= 1 || !result.rows.some((r) => r.row === e.row)).map((e, i) => (
              <p key={i}>
                {e.row <= 1 ? "Header" : `Row ${e.row}`}, {e.field}: {e.message}
              </p>
            ))}
          </Notice>
        )
      ) : null}
      {result && result.rows.length ? (
        <div className="overflow-x-auto rounded-xl border border-line bg-card">
          <table className="w-full text-left text-sm">
            <thead>
              <tr className="border-b border-line [&>th]:px-3 [&>th]:py-2">
                <th scope="col">Row</th>
                <th scope="col">Check</th>
                <th scope="col">Title</th>
                <th scope="col">Kind</th>
                <th scope="col">Species</th>
                <th scope="col">Delivered</th>
                <th scope="col">Layers</th>
              </tr>
            </thead>
            <tbody>
              {result.rows.map((r) => (
                <tr key={r.row} className="border-b border-line align-top last:border-b-0 [&>td]:px-3 [&>td]:py-2">
                  <td>{r.row}</td>
                  <td>
                    {r.ok ? (
                      <span className="inline-flex items-center gap-1 text-ok">
                        <SpriteIcon name="circle-check" className="size-4" /> Valid
                      </span>
                    ) : (
                      <div className="space-y-1 text-danger">
                        <span className="inline-flex items-center gap-1 font-semibold">
                          <SpriteIcon name="circle-exclamation-point" className="size-4" /> Problem
                        </span>
                        {byRow.get(r.row)?.map((e, i) => (
                          <p key={i}>
                            {e.field}: {e.message}
                          </p>
                        ))}
                      </div>
                    )}
                  </td>
                  <td>{r.title}</td>
                  <td>{r.kind}</td>
                  <td>{r.primarySpecies}</td>
                  <td>{r.deliveredOn}</td>
                  <td>{r.layers}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      ) : null}
      {result?.ok && !result.committed ? (
        <label className="flex min-h-11 items-center gap-2 text-sm">
          <input type="checkbox" checked={mailBuyers} onChange={(e) => setMailBuyers(e.target.checked)} className="size-4" />
          Send the buyers their hand-over mail now (those with an e-mail who agreed to service mail). Leave it, and send it later from each piece&apos;s page — or never.
        </label>
      ) : null}
      {result?.ok && !result.committed ? (
        <Button onClick={commit} disabled={busy !== null}>
          Import {result.rows.length} piece{result.rows.length === 1 ? "" : "s"}
        </Button>
      ) : null}
    </div>
  );
}
