// For the clock sweep (scripts/e2e-week.mjs). libfaketime shifts the wall clock of Playwright's runner,
// the seed and the e2e server, but Chromium misbehaves under it (its helper processes stall and the
// network service crashes), so the browser runs on the real clock and every browser context it opens
// gets the runner's shifted time through Playwright's clock API before any page loads. Time then flows
// on naturally, as it does in the other processes.
import { chromium, type Browser, type BrowserContextOptions } from "@playwright/test";

/** Environment variables that put a process under libfaketime; Chromium is started without them. */
export const FAKETIME_VARS = ["LD_PRELOAD", "FAKETIME", "FAKETIME_DONT_FAKE_MONOTONIC"];

export function withoutFaketime(env: NodeJS.ProcessEnv): Record<string, string> {
  return Object.fromEntries(Object.entries(env).filter((e): e is [string, string] => e[1] !== undefined && !FAKETIME_VARS.includes(e[0])));
}

/** Every browser launched in this process installs the runner's clock into each new context. */
export function shiftBrowserClocks() {
  const browserType = Object.getPrototypeOf(chromium) as { launch: (...args: unknown[]) => Promise<Browser>; __gwShifted?: boolean };
  if (browserType.__gwShifted) return;
  browserType.__gwShifted = true;
  const launch = browserType.launch;
  browserType.launch = async function (this: unknown, ...args: unknown[]) {
    const browser = await launch.apply(this, args);
    const newContext = browser.newContext.bind(browser);
    // browser.newPage() and the `context`/`page` fixtures all come through here.
    browser.newContext = async (options?: BrowserContextOptions) => {
      const context = await newContext(options);
      await context.clock.install({ time: Date.now() });
      return context;
    };
    return browser;
  };
}
