import type { Metadata } from "next";
import { CsvImport } from "@/components/pieces/csv-import";
import { PageHeader } from "@/components/ui/card";
import { requireStaff } from "@/lib/auth/guards";
import { forPage } from "@/lib/auth/page";
import { CSV_COLUMNS } from "@/lib/pieces/csv";

export const metadata: Metadata = { title: "Import pieces" };

export default async function ImportPiecesPage() {
  await forPage(requireStaff);
  return (
    <>
      <PageHeader title="Import earlier deliveries" lead="Check a spreadsheet of pieces delivered before Grainward, then import it in one go." />
      <CsvImport columns={CSV_COLUMNS} />
    </>
  );
}
