import { describe, expect, it } from "vitest";
import { decodeCrockford, encodeCrockford, isValidRegistrationCode, normalizeRegistrationCode } from "@/lib/care";

// Source: Douglas Crockford, "Base 32", crockford.com/base32.html:
// 1 → "1" (with check "11"); 194 → "62" ("629"); 398373 → "C515" ("C515Z").
const VECTORS: ReadonlyArray<[number, string, string]> = [
  [1, "1", "11"],
  [194, "62", "629"],
  [398373, "C515", "C515Z"],
];

describe("Crockford Base32 published vectors (crockford.com/base32.html)", () => {
  it.each(VECTORS)("%i encodes as %s and %s with its mod-37 check symbol", (n, symbols, withCheck) => {
    expect(encodeCrockford(n)).toBe(symbols);
    expect(encodeCrockford(n, { check: true })).toBe(withCheck);
    expect(decodeCrockford(symbols)).toBe(BigInt(n));
    expect(decodeCrockford(withCheck, { check: true })).toBe(BigInt(n));
  });

  it("decoding ignores case and hyphens and reads I, L as 1 and O as 0 (Crockford, Decoding)", () => {
    expect(decodeCrockford("c5-15")).toBe(398373n);
    expect(decodeCrockford("i")).toBe(1n);
    expect(decodeCrockford("L")).toBe(1n);
    expect(decodeCrockford("o1")).toBe(1n);
  });

  it("check symbols 32–36 are * ~ $ = U (Crockford, Check Symbol)", () => {
    expect(encodeCrockford(32, { check: true })).toBe("10*");
    expect(encodeCrockford(33, { check: true })).toBe("11~");
    expect(encodeCrockford(34, { check: true })).toBe("12$");
    expect(encodeCrockford(35, { check: true })).toBe("13=");
    expect(encodeCrockford(36, { check: true })).toBe("14U");
  });

  it("a wrong check symbol is rejected", () => {
    expect(() => decodeCrockford("C515Y", { check: true })).toThrow(/check symbol/);
  });

  it("a 13-symbol code built from the vector value 398373 validates, and normalizes I/L/O", () => {
    const code = encodeCrockford(398373, { check: true, minLength: 12 }); // 00000000C515Z
    expect(code).toBe("00000000C515Z");
    expect(isValidRegistrationCode(code)).toBe(true);
    expect(normalizeRegistrationCode("oooo oooo c5l5 z")).toBe("0000-0000-C515-Z");
  });
});
