// The headers next.config.mjs puts on every answer (lib/http/security-headers.mjs).
import { describe, expect, it } from "vitest";
import { securityHeaders } from "@/lib/http/security-headers.mjs";

const get = (headers: { key: string; value: string }[], key: string) => headers.find((h) => h.key === key)?.value;

describe("security headers", () => {
  it("HSTS when APP_URL is https, and never over plain http", () => {
    expect(get(securityHeaders({ appUrl: "https://care.example", dev: false }), "Strict-Transport-Security")).toBe("max-age=63072000; includeSubDomains");
    expect(get(securityHeaders({ appUrl: "http://localhost:3000", dev: false }), "Strict-Transport-Security")).toBeUndefined();
    expect(get(securityHeaders({ appUrl: undefined, dev: true }), "Strict-Transport-Security")).toBeUndefined();
  });

  it("the CSP allows eval only on the development server, and never framing or plugins", () => {
    const prod = get(securityHeaders({ appUrl: "https://care.example", dev: false }), "Content-Security-Policy")!;
    expect(prod).not.toContain("unsafe-eval");
    expect(prod).toContain("frame-ancestors 'none'");
    expect(prod).toContain("object-src 'none'");
    expect(get(securityHeaders({ appUrl: "http://localhost:3000", dev: true }), "Content-Security-Policy")).toContain("'unsafe-eval'");
  });
});
