import type { ReactNode } from "react";
import { Card } from "@/components/ui/card";

export function AuthCard({ title, lead, children }: { title: string; lead?: ReactNode; children: ReactNode }) {
  return (
    <div className="mx-auto w-full max-w-md px-4 py-10 sm:py-16">
      <Card className="space-y-5 p-6 sm:p-8">
        <div className="space-y-1">
          <h1 className="font-display text-2xl font-semibold">{title}</h1>
          {lead ? <div className="text-sm text-muted">{lead}</div> : null}
        </div>
        {children}
      </Card>
    </div>
  );
}
