// The import directions of DEVELOPERS.md are enforced by ESLint (eslint.config.mjs). Each case lints
// a one-line module as if it stood at the given path, with the project's real configuration.
import path from "node:path";
import { ESLint } from "eslint";
import { beforeAll, describe, expect, it } from "vitest";

let eslint: ESLint;
beforeAll(() => {
  eslint = new ESLint({ cwd: path.resolve(import.meta.dirname, "../..") });
});

async function restricted(filePath: string, code: string): Promise<boolean> {
  const [result] = await eslint.lintText(code, { filePath });
  return result!.messages.some((m) => m.ruleId === "no-restricted-imports");
}

describe("import directions", () => {
  it.each([
    ["app never imports db", "app/studio/x/page.tsx", 'import { getDb } from "@/db/client";\nexport const x = getDb;\n'],
    ["components never import db", "components/x/y.tsx", 'import { pieces } from "@/db/schema";\nexport const x = pieces;\n'],
    ["components never import a server module as a value", "components/x/y.tsx", 'import { listClaims } from "@/lib/claims/service";\nexport const x = listClaims;\n'],
    ["components never import app pages", "components/x/y.tsx", 'import Page from "@/app/studio/page";\nexport const x = Page;\n'],
    ["lib/care imports nothing outside itself", "lib/care/x.ts", 'import { env } from "@/lib/env";\nexport const x = env;\n'],
    ["lib/care imports no package", "lib/care/x.ts", 'import { z } from "zod";\nexport const x = z;\n'],
    ["lib never imports app", "lib/x/y.ts", 'import { signOutAction } from "@/app/actions/session";\nexport const x = signOutAction;\n'],
    ["emails never import db", "emails/x.tsx", 'import { getDb } from "@/db/client";\nexport const x = getDb;\n'],
    ["the product never imports lib/fakes", "lib/payments/x.ts", 'import { startStripeFake } from "@/lib/fakes/stripe-fake";\nexport const x = startStripeFake;\n'],
    ["jobs never import lib/fakes", "jobs/x.ts", 'import { startSmtpSink } from "@/lib/fakes/smtp-sink";\nexport const x = startSmtpSink;\n'],
    ["a route handler never calls a guard (it names roles in route())", "app/api/x/route.ts", 'import { requireStaff } from "@/lib/auth/guards";\nexport const x = requireStaff;\n'],
    ["a server action never reads the session itself (it names roles in action())", "app/x/actions.ts", 'import { getCurrentSession } from "@/lib/auth/session";\nexport const x = getCurrentSession;\n'],
    ["a route handler never resolves the actor itself", "app/api/x/route.ts", 'import { requireActor } from "@/lib/auth/actor";\nexport const x = requireActor;\n'],
    ["route handlers still never import db", "app/api/x/route.ts", 'import { getDb } from "@/db/client";\nexport const x = getDb;\n'],
  ])("%s", async (_rule, filePath, code) => {
    expect(await restricted(filePath, code)).toBe(true);
  });

  it.each([
    ["components import server modules as types", "components/x/y.tsx", 'import type { ClaimCoverage } from "@/lib/claims/coverage";\nexport type X = ClaimCoverage;\n'],
    ["components import pure lib/care values", "components/x/y.tsx", 'import { SPECIES } from "@/lib/care/species";\nexport const x = SPECIES;\n'],
    ["components import server actions", "components/x/y.tsx", 'import { signOutAction } from "@/app/actions/session";\nexport const x = signOutAction;\n'],
    ["lib/care imports its own files", "lib/care/x.ts", 'import { SPECIES } from "./species";\nexport const x = SPECIES;\n'],
    ["a route handler imports the wrappers and guards' helpers", "app/api/x/route.ts", 'import { homePathFor } from "@/lib/auth/guards";\nimport { route } from "@/lib/http/route";\nexport const x = [homePathFor, route];\n'],
    ["a page still calls a guard", "app/studio/x/page.tsx", 'import { requireStaff } from "@/lib/auth/guards";\nexport const x = requireStaff;\n'],
    ["tests import lib/fakes", "tests/integration/x.test.ts", 'import { startSmtpSink } from "@/lib/fakes/smtp-sink";\nexport const x = startSmtpSink;\n'],
  ])("allowed: %s", async (_rule, filePath, code) => {
    expect(await restricted(filePath, code)).toBe(false);
  });
});

// The same configuration checks two chores that have one way each (DEVELOPERS.md).
async function ruleHits(filePath: string, code: string, rule: string): Promise<boolean> {
  const [result] = await eslint.lintText(code, { filePath });
  return result!.messages.some((m) => m.ruleId === rule);
}

describe("one way for each chore", () => {
  it.each([
    ["an AppError made outside lib/errors.ts", "lib/x/y.ts", 'import { AppError } from "@/lib/errors";\nexport const e = new AppError(409, "conflict", "Taken.");\n', "no-restricted-syntax"],
    ["a subclass of AppError", "lib/x/y.ts", 'import { AppError } from "@/lib/errors";\nexport class TakenError extends AppError {}\n', "no-restricted-syntax"],
    ["fetch in a component", "components/x/y.tsx", 'export const load = () => fetch("/api/pieces");\n', "no-restricted-globals"],
    ["XMLHttpRequest in a component", "components/x/y.tsx", "export const xhr = () => new XMLHttpRequest();\n", "no-restricted-globals"],
    ["a lucide-react icon in a page", "app/studio/x/page.tsx", 'import { Plus } from "lucide-react";\nexport const x = Plus;\n', "no-restricted-imports"],
    ["a lucide-react icon in a component", "components/x/y.tsx", 'import { Plus } from "lucide-react";\nexport const x = Plus;\n', "no-restricted-imports"],
    ["a lucide-react icon in lib", "lib/x/y.ts", 'import { Plus } from "lucide-react";\nexport const x = Plus;\n', "no-restricted-imports"],
    ["a lucide-react icon file in an e-mail", "emails/x.tsx", 'import Plus from "lucide-react/dist/esm/icons/plus.mjs";\nexport const x = Plus;\n', "no-restricted-imports"],
    ["a lucide-react type in a test", "tests/unit/x.test.ts", 'import type { LucideIcon } from "lucide-react";\nexport type X = LucideIcon;\n', "no-restricted-imports"],
  ])("refused: %s", async (_what, filePath, code, rule) => {
    expect(await ruleHits(filePath, code, rule)).toBe(true);
  });

  it.each([
    ["lib/errors.ts makes AppErrors", "lib/errors.ts", 'export class AppError extends Error {}\nexport const e = new AppError();\n', "no-restricted-syntax"],
    ["the client API module calls fetch", "components/api-client.ts", 'export const load = () => fetch("/api/pieces");\n', "no-restricted-globals"],
    ["the sprite script reads lucide-react", "scripts/icon-sprite.ts", 'import { Plus } from "lucide-react";\nexport const x = Plus;\n', "no-restricted-imports"],
    ["tests make AppErrors", "tests/unit/x.test.ts", 'import { AppError } from "@/lib/errors";\nexport const e = new AppError(409, "conflict", "Taken.");\n', "no-restricted-syntax"],
  ])("allowed: %s", async (_what, filePath, code, rule) => {
    expect(await ruleHits(filePath, code, rule)).toBe(false);
  });
});
