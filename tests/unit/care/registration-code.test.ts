import fc from "fast-check";
import { describe, expect, it } from "vitest";
import {
  CROCKFORD_ALPHABET,
  CROCKFORD_CHECK_ALPHABET,
  generateRegistrationCode,
  isValidRegistrationCode,
  normalizeRegistrationCode,
} from "@/lib/care";

const FORMAT = /^[0-9A-HJKMNP-TV-Z]{4}-[0-9A-HJKMNP-TV-Z]{4}-[0-9A-HJKMNP-TV-Z]{4}-[0-9A-HJKMNP-TV-Z*~$=U]$/;

describe("registration codes", () => {
  it("a generated code is XXXX-XXXX-XXXX-C and validates (property over 1000 codes)", () => {
    fc.assert(
      fc.property(fc.constant(null), () => {
        const code = generateRegistrationCode();
        expect(code).toMatch(FORMAT);
        expect(isValidRegistrationCode(code)).toBe(true);
        expect(normalizeRegistrationCode(code)).toBe(code);
      }),
      { numRuns: 1000 },
    );
  });

  it("any one-symbol change to a generated code never validates (property)", () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 12 }), fc.integer({ min: 1, max: 36 }), (pos, shift) => {
        const code = generateRegistrationCode().replace(/-/g, "");
        const alphabet = pos === 12 ? CROCKFORD_CHECK_ALPHABET : CROCKFORD_ALPHABET;
        const i = alphabet.indexOf(code[pos]!);
        const replacement = alphabet[(i + (shift % alphabet.length || 1)) % alphabet.length]!;
        const changed = code.slice(0, pos) + replacement + code.slice(pos + 1);
        expect(changed).not.toBe(code);
        expect(isValidRegistrationCode(changed)).toBe(false);
      }),
      { numRuns: 2000 },
    );
  });

  it("normalizes case, spaces, hyphens, and I/L → 1, O → 0 (Crockford)", () => {
    const code = generateRegistrationCode();
    const sloppy = `  ${code.toLowerCase().replace(/-/g, " ")} `;
    expect(normalizeRegistrationCode(sloppy)).toBe(code);
    expect(normalizeRegistrationCode("oooo-iiii-llll-x")).toBe("0000-1111-1111-X");
  });

  it("rejects wrong lengths and foreign symbols", () => {
    expect(normalizeRegistrationCode("ABCD-EFGH-JKMN")).toBeNull();
    expect(normalizeRegistrationCode("ABCD-EFGH-JKMN-PQ")).toBeNull();
    expect(normalizeRegistrationCode("ABCD-EFGH-JKMU-P")).toBeNull(); // U only as a check symbol
    expect(isValidRegistrationCode("ABCD-EFGH-JK#N-P")).toBe(false);
    expect(isValidRegistrationCode("")).toBe(false);
  });

  it("uses crypto.getRandomValues: 200 codes are all different", () => {
    expect(new Set(Array.from({ length: 200 }, generateRegistrationCode)).size).toBe(200);
  });
});
