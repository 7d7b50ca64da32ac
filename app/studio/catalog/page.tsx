import type { Metadata } from "next";
import { CatalogManager } from "@/components/catalog/catalog-manager";
import { PageHeader } from "@/components/ui/card";
import { requireAdmin } from "@/lib/auth/guards";
import { forPage } from "@/lib/auth/page";
import { listCatalog } from "@/lib/catalog";

export const metadata: Metadata = { title: "Finish catalog" };

export default async function CatalogPage() {
  const ctx = await forPage(requireAdmin);
  const products = listCatalog(ctx);
  return (
    <>
      <PageHeader title="Finish catalog" lead="The finish products the studio uses: coverage, containers, prices and how long each lasts by use. The care schedules follow these intervals." />
      <CatalogManager products={products} currency={ctx.studio.currency} country={ctx.studio.country} units={ctx.studio.unitSystem} />
    </>
  );
}
