import type { Metadata } from "next";
import { BookVisit } from "@/components/visits/book-visit";
import { requireStaff } from "@/lib/auth/guards";
import { forPage } from "@/lib/auth/page";
import { bookingContext } from "@/lib/visits/job-visit";

export const metadata: Metadata = { title: "Book a visit" };

export default async function StaffBookVisitPage({ params }: { params: Promise<{ jobId: string }> }) {
  const { jobId } = await params;
  return <BookVisit b={await forPage(async () => bookingContext(await requireStaff(), jobId))} audience="staff" />;
}
