import type { Metadata } from "next";
import { BookVisit } from "@/components/visits/book-visit";
import { requireUser } from "@/lib/auth/guards";
import { forPage } from "@/lib/auth/page";
import { bookingContext } from "@/lib/visits/job-visit";
import { ownerActor } from "@/lib/auth/actor";

export const metadata: Metadata = { title: "Book your visit" };

export default async function OwnerBookVisitPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const user = await forPage(requireUser);
  return <BookVisit b={await forPage(async () => bookingContext(ownerActor(user), id))} audience="owner" />;
}
