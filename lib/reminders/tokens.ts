// Opaque, signed tokens for the links in care mail: unsubscribe (one per owner) and accepting a refresh
// offer (one per offer). A token is base64url(id) "." HMAC(id) keyed from APP_SECRET per purpose
// (lib/crypto sign), so it cannot be forged or moved to another owner or offer. No server-only import:
// the scheduler builds these links too.
import { timingSafeEqual } from "node:crypto";
import { sign } from "@/lib/crypto";
import { env } from "@/lib/env";

type Purpose = "unsubscribe" | "refresh-offer";

function makeToken(purpose: Purpose, id: string): string {
  return `${Buffer.from(id, "utf8").toString("base64url")}.${sign(purpose, id)}`;
}

function readToken(purpose: Purpose, token: string): string | null {
  if (typeof token !== "string" || token.length > 300) return null;
  const dot = token.indexOf(".");
  if (dot <= 0) return null;
  const id = Buffer.from(token.slice(0, dot), "base64url").toString("utf8");
  if (id.length === 0 || id.length > 100) return null;
  const expected = Buffer.from(sign(purpose, id));
  const given = Buffer.from(token.slice(dot + 1));
  return given.length === expected.length && timingSafeEqual(given, expected) ? id : null;
}

export const unsubscribeToken = (userId: string) => makeToken("unsubscribe", userId);
/** The owner's id, or null for a token that was not made by us. */
export const readUnsubscribeToken = (token: string) => readToken("unsubscribe", token);
export const offerToken = (offerId: string) => makeToken("refresh-offer", offerId);
export const readOfferToken = (token: string) => readToken("refresh-offer", token);

function appUrl(path: string): string {
  return new URL(path, env.APP_URL).toString();
}

/**
 * The List-Unsubscribe URL (RFC 8058 one-click POST target; a GET shows the confirmation page).
 * RFC 8058 asks for an https URI; we use APP_URL as configured, which is http://localhost in the
 * demo and tests and https in production.
 */
export const oneClickUnsubscribeUrl = (userId: string) => appUrl(`/api/unsubscribe?t=${unsubscribeToken(userId)}`);
/** The page where an owner turns care mail off or back on, without signing in. */
export const preferencesUrl = (userId: string) => appUrl(`/unsubscribe?t=${unsubscribeToken(userId)}`);
export const offerUrl = (offerId: string) => appUrl(`/offers/${offerToken(offerId)}`);
export const pieceUrl = (pieceId: string) => appUrl(`/pieces/${encodeURIComponent(pieceId)}`);
export const logCareUrl = (pieceId: string, taskKey: string) =>
  appUrl(`/pieces/${encodeURIComponent(pieceId)}/log?task=${encodeURIComponent(taskKey)}`);

/**
 * The RFC 2369 / RFC 8058 headers every care reminder and offer carries: the one-click https address
 * only. No mailto: address is advertised, because nothing reads mail sent back to the app.
 */
export function unsubscribeHeaders(userId: string): Record<string, string> {
  return {
    "List-Unsubscribe": `<${oneClickUnsubscribeUrl(userId)}>`,
    "List-Unsubscribe-Post": "List-Unsubscribe=One-Click",
  };
}
