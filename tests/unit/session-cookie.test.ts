// The session cookie's attributes under each deployment address (a fresh process per address, since
// lib/env reads the environment once).
import { execFileSync } from "node:child_process";
import { describe, expect, it } from "vitest";

function cookieAttributes(appUrl: string) {
  const out = execFileSync(
    process.execPath,
    ["--import", "tsx", "-e", `import("./lib/auth/lucia.ts").then(m => console.log(JSON.stringify(m.getLucia().createSessionCookie("token").attributes)))`],
    { env: { ...process.env, APP_URL: appUrl, APP_SECRET: "a".repeat(40), STRIPE_API_HOST: "", STRIPE_SECRET_KEY: "sk_test_" + "b".repeat(24) }, encoding: "utf8" },
  );
  return JSON.parse(out.trim().split("\n").pop()!);
}

describe("session cookie", () => {
  it("is Secure, HttpOnly and SameSite=Lax when served over https", () => {
    expect(cookieAttributes("https://grainward.example")).toMatchObject({ secure: true, httpOnly: true, sameSite: "lax", path: "/" });
  });

  it("drops Secure only for a plain-http local demo", () => {
    expect(cookieAttributes("http://localhost:3000")).toMatchObject({ secure: false, httpOnly: true, sameSite: "lax" });
  });
});
