// The owner's units default from their browser's locale, else the studio, through
// what the pages use: registerPiece (the register page's action and POST /api/registrations pass the
// request's Accept-Language), the signed-in user as the session gives it to a page, getMyPiece (the
// piece page) and claimFormContext (the claim form's °F/°C). Real SQLite file. 1 in = 25.4 mm (NIST HB 44, App. C).
import { describe, expect, it } from "vitest";
import { getLucia } from "@/lib/auth/lucia";
import { claimFormContext } from "@/lib/claims/file-claim";
import { getMyPiece } from "@/lib/owner/pieces";
import { updatePreferences } from "@/lib/owner/preferences";
import { registerPiece } from "@/lib/owner/registration";
import { createPiece, createStudio, createUser } from "../support/fixtures";

/** The user a page gets from its session (lib/auth/session → lucia.validateSession). */
async function pageUser(userId: string) {
  const lucia = getLucia();
  const session = await lucia.createSession(userId, {});
  const { user } = await lucia.validateSession(session.id);
  return user!;
}

async function registerWith(studioUnits: "metric" | "imperial", acceptLanguage: string | null, ip: string, chooseFirst?: "metric" | "imperial") {
  const studio = createStudio({ unitSystem: studioUnits });
  const owner = await createUser({ emailVerifiedAt: new Date(), unitSystem: studioUnits === "metric" ? "imperial" : "metric" });
  if (chooseFirst) updatePreferences(owner, { unitSystem: chooseFirst });
  // 2438.4 mm = 96 in; 955.675 mm = 37 5/8 in (stored rounded to 2438 and 956).
  const { piece, code } = createPiece(studio, { lengthMm: 2438, widthMm: 956 });
  await registerPiece(owner, { code }, ip, new Date(), { acceptLanguage });
  const user = await pageUser(owner.id);
  return { user, piece: getMyPiece(user, piece.id), claimForm: claimFormContext(user, piece.id) };
}

describe("owner units from the browser's locale", () => {
  it("an en-US browser at a metric studio reads inches and °F", async () => {
    const r = await registerWith("metric", "en-US,en;q=0.9", "203.0.113.61");
    expect(r.user.unitSystem).toBe("imperial");
    expect(r.piece.size).toBe("96 × 37 5/8 in");
    expect(r.claimForm.unit).toBe("F");
  });

  it("an en-GB browser at an imperial studio reads millimetres and °C", async () => {
    const r = await registerWith("imperial", "en-GB,en;q=0.8", "203.0.113.62");
    expect(r.user.unitSystem).toBe("metric");
    expect(r.piece.size).toBe("2,438 × 956 mm");
    expect(r.claimForm.unit).toBe("C");
  });

  it("a language without a region, or no header, leaves it to the studio", async () => {
    expect((await registerWith("imperial", "en", "203.0.113.63")).user.unitSystem).toBe("imperial");
    expect((await registerWith("metric", null, "203.0.113.64")).user.unitSystem).toBe("metric");
  });

  it("an owner who chose their units keeps them", async () => {
    const r = await registerWith("imperial", "en-US", "203.0.113.65", "metric");
    expect(r.user.unitSystem).toBe("metric");
    expect(r.claimForm.unit).toBe("C");
  });
});
