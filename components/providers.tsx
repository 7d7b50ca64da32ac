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
      {/* Bottom of the screen: at the top, a toast covered the site menu. The rich colours' text is
          darkened to pass WCAG AA (4.5:1) on its tinted background (sonner's own success green is 4.3:1). */}
      <Toaster
        position="bottom-center"
        richColors
        closeButton
        style={
          {
            "--success-text": "hsl(140, 100%, 20%)",
            "--error-text": "hsl(360, 100%, 35%)",
            "--info-text": "hsl(210, 92%, 33%)",
            "--warning-text": "hsl(31, 92%, 28%)",
          } as React.CSSProperties
        }
      />
    </QueryClientProvider>
  );
}
