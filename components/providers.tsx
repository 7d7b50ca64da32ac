"use client";

import { QueryClient, QueryClientProvider } from "@tanstack/react-query";
import { useState, type ReactNode } from "react";
import { Toaster } from "sonner";

export function Providers({ children }: { children: ReactNode }) {
  const [client] = useState(
    () => new QueryClient({ defaultOptions: { queries: { staleTime: 15_000, retry: 1 } } }),
  );
  return (
    <QueryClientProvider client={client}>
      {children}
      {/* Bottom of the screen: at the top, a toast covered the site menu. */}
      <Toaster position="bottom-center" richColors closeButton />
    </QueryClientProvider>
  );
}
