// The studio a message is sent for, for the shared layout (./layout.tsx) to show its name, logo and
// accent. lib/mail renders each message inside withEmailBrand(); templates need not pass it along.
// An AsyncLocalStorage rather than a React context: templates are also rendered where only the
// server build of React is loaded, which has no createContext.
import { AsyncLocalStorage } from "node:async_hooks";

export type EmailBrand = {
  name: string;
  /** Absolute URL of the studio's logo, or null for its name alone. */
  logoUrl: string | null;
  /** The studio's accent (lib/studio/brand.ts: each keeps 4.5:1 with white and the paper). */
  accent: string;
};

const current = new AsyncLocalStorage<EmailBrand | null>();

export function withEmailBrand<T>(brand: EmailBrand | null, render: () => Promise<T>): Promise<T> {
  return current.run(brand, render);
}

export function emailBrand(): EmailBrand | null {
  return current.getStore() ?? null;
}
