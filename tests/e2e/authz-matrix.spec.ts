// The authorization matrix: every route handler and every server action of the app, enumerated from
// the file system (and the build's server-reference manifest), × every role, against the production
// build. A route, method or action without a row here fails the first test by name.
//
// Each row sends one request per role and names the answer expected for each. Roles that are refused
// must be refused before anything happens (401 not signed in, 403 wrong role, 404 someone else's
// object or another studio's, so its existence is not revealed); roles that are allowed must get past
// authorization: a 2xx, or a 400/409/422 from a harmless request (an invalid body, or a state change
// the object's state forbids). Writes that do happen land on throwaway rows made here, or are no-ops
// (the values already stored), so the shared fixture stays as the other specs expect it.
import fs from "node:fs";
import { expect, test, type APIRequestContext, type APIResponse } from "@playwright/test";
import { generateRegistrationCode } from "@/lib/care/registration-code";
import { CLAIM_CATEGORIES } from "@/lib/care/vocabulary";
import { ACCOUNTS, PASSWORD } from "./helpers";
import { appRoutes, fill, manifestActions, pagePattern, serverActions, type ManifestAction } from "./routes";

// ---------------------------------------------------------------- roles and fixture

const WHO = ["anonymous", "owner", "otherOwner", "technician", "staff", "admin", "otherStudioStaff", "otherStudioAdmin"] as const;
type Who = (typeof WHO)[number];
type SignedIn = Exclude<Who, "anonymous">;

/** helpers.ACCOUNTS plus the other studio's admin that tests/support/seed-e2e.ts adds for this spec. */
const EMAIL: Record<SignedIn, string> = { ...ACCOUNTS, otherStudioAdmin: "admin@other-studio.example" };

// Requests go out in this order, so a role that may change something comes after every role refused.
const RUN_ORDER: Who[] = ["anonymous", "otherOwner", "otherStudioStaff", "otherStudioAdmin", "technician", "owner", "staff", "admin"];

type Fixture = {
  demoPieceId: string;
  otherPieceId: string;
  jobs: Record<"quoted" | "approved" | "draft" | "paid" | "covered" | "done", string>;
  matrix: {
    demoStudioId: string;
    otherStudioId: string;
    ownerPieceId: string;
    ownerPieceDeliveredOn: string;
    ownerPiecePaused: boolean;
    ownerClaimId: string;
    ownerClaimPhotoId: string;
    ownerCareLogEntryId: string;
    doneVisitId: string;
    solBookedVisitId: string;
    inesId: string;
    solId: string;
    adminMembershipId: string;
    technicianMembershipId: string;
    sentReminderId: string;
    spare: { pieceId: string; code: string };
  };
};
const F: Fixture = JSON.parse(fs.readFileSync(process.env.E2E_FIXTURE_FILE ?? "tests/.tmp/e2e-fixture.json", "utf8"));
const X = F.matrix;
const J = F.jobs;

// The rows aimed at (tests/support/seed-e2e.ts): the owner's piece, declined claim and its photo, a
// care-log entry; the owner's paid job (no visit yet) and done job, whose visit was Ines's; a booked
// visit of Sol's on the owner's job. The quoted, approved and covered jobs are the other owner's.
const DAY = 86_400_000;
const future = (days: number) => new Date(Date.now() + days * DAY).toISOString();

/** What a role must never read in a 2xx answer: ids and names of rows that are not theirs. */
const OWNER_ROWS = [X.ownerPieceId, X.ownerClaimId, X.ownerClaimPhotoId, X.ownerCareLogEntryId, J.paid, J.done, J.draft, X.doneVisitId];
const DEMO_STUDIO_ROWS = [X.demoStudioId, F.demoPieceId, ...OWNER_ROWS, ...Object.values(J), X.solBookedVisitId, X.inesId, X.solId, X.sentReminderId, "Walnut river dining table", "Larchmere Slab & Resin"];
const SECRETS: Record<Who, string[]> = {
  anonymous: [...DEMO_STUDIO_ROWS, F.otherPieceId, X.otherStudioId],
  owner: [J.quoted, J.approved, J.covered, F.otherPieceId, X.otherStudioId],
  otherOwner: OWNER_ROWS,
  technician: [X.ownerClaimId, X.ownerClaimPhotoId, F.otherPieceId, X.otherStudioId],
  staff: [F.otherPieceId, X.otherStudioId],
  admin: [F.otherPieceId, X.otherStudioId],
  otherStudioStaff: DEMO_STUDIO_ROWS,
  otherStudioAdmin: DEMO_STUDIO_ROWS,
};

/** An 8-column row, in WHO order. */
function parseRow(expect: string, where: string): Record<Who, string> {
  const cells = expect.trim().split(/\s+/);
  if (cells.length !== WHO.length) throw new Error(`${where}: ${cells.length} cells, want ${WHO.length} (${WHO.join(" ")})`);
  return Object.fromEntries(WHO.map((w, i) => [w, cells[i]!])) as Record<Who, string>;
}

// ---------------------------------------------------------------- per-run state

type Api = Record<Who, APIRequestContext>;
type State = {
  api: Api;
  product: { id: string; name: string };
  piece: { id: string; title: string };
  layerId: string;
  layerToDelete: Record<"staff" | "admin", string>;
  pieceToDelete: Record<"staff" | "admin", string>;
  careEntryToDelete: string;
  prefs: Record<Who, unknown>;
  names: Record<Who, string>;
  studio: Record<"admin" | "otherStudioAdmin", { profile: unknown; reminders: unknown; visits: unknown }>;
  inesHours: unknown;
  clients: { demo: { id: string; name: string }; other: { id: string; name: string } };
  /** A throwaway client of the demo studio for the erase row. */
  erasable: string;
  /** The conversation on the owner's declined claim (the seed's owner message). */
  threadId: string;
};
let S: State;
const contexts: APIRequestContext[] = [];

/**
 * A request context of its own per role, signed in through the sign-in form's server action (no
 * page needed: the matrix only speaks HTTP). `next` points at a cheap answer, so the action's
 * redirect does not render a whole start page.
 */
async function contextFor(newContext: () => Promise<APIRequestContext>, who: Who, baseURL: string): Promise<APIRequestContext> {
  const api = await newContext();
  contexts.push(api);
  if (who === "anonymous") return api;
  const signInAction = manifestActions().find((a) => a.file === "app/(public)/sign-in/actions.ts" && a.name === "signInAction")!;
  const out = await callAction(api, signInAction, { json: [{ email: EMAIL[who], password: PASSWORD, next: "/api/health" }] }, baseURL);
  expect(out.redirect, `signing in as ${who}: ${out.raw.slice(0, 200)}`).toBe("/api/health");
  expect((await api.get("/api/me")).status(), `${who}'s session`).toBe(200);
  return api;
}

async function json<T = Record<string, unknown>>(res: APIResponse, what: string, status?: number): Promise<T> {
  if (status !== undefined) expect(res.status(), `${what}: ${await res.text()}`).toBe(status);
  return (await res.json()) as T;
}

/**
 * Registers the spare piece (the other studio's, seeded unowned for this spec) to the owner, for a
 * release row: its studio issues a fresh code, the owner registers with it.
 */
async function registerSpare(): Promise<void> {
  const issued = await json<{ registrationCode: string }>(await S.api.otherStudioStaff.post(`/api/pieces/${X.spare.pieceId}/registration-code`), "a fresh code for the spare piece", 200);
  const res = await S.api.owner.post("/api/registrations", { data: { code: issued.registrationCode } });
  expect((await json<{ pieceId: string }>(res, "registering the spare piece", 201)).pieceId).toBe(X.spare.pieceId);
}

/** Throwaway rows of the demo studio for the registry and catalog rows, made once, on first use. */
async function throwaways(): Promise<void> {
  if (S.piece) return;
  const { staff, admin } = S.api;
  const title = "Matrix throwaway shelf (invented, authorization matrix)";
  const newPiece = async () => {
    const res = await staff.post("/api/pieces", {
      data: { kind: "shelf", title, shapeKind: "rectangle", lengthMm: 900, widthMm: 250, primarySpeciesId: "red_oak", use: "light", deliveredOn: "2026-02-01", layers: [validLayer] },
    });
    return (await json<{ piece: { id: string } }>(res, "creating a throwaway piece", 201)).piece.id;
  };
  S.piece = { id: await newPiece(), title };
  S.pieceToDelete = { staff: await newPiece(), admin: await newPiece() };
  const detail = await json<{ layers: { id: string }[] }>(await staff.get(`/api/pieces/${S.piece.id}`), "reading the throwaway piece", 200);
  S.layerId = detail.layers[0]!.id;
  const newLayer = async () => (await json<{ layer: { id: string } }>(await staff.post(`/api/pieces/${S.piece.id}/layers`, { data: validLayer }), "adding a throwaway layer", 201)).layer.id;
  S.layerToDelete = { staff: await newLayer(), admin: await newLayer() };
  // Its class and name sort it after the demo products.
  const product = await admin.post("/api/catalog", { data: { name: "Matrix throwaway paste wax (invented)", finishClass: "paste_wax", coverageM2PerL: 20 } });
  S.product = (await json<{ product: { id: string; name: string } }>(product, "creating a throwaway product", 201)).product;
}

/** A care-log entry of the owner's dated on the delivery day: older than the real history, so no schedule moves. */
/** A client of the demo studio made for the erase row (once per run). */
async function erasableClient(): Promise<void> {
  if (S.erasable) return;
  const made = await json<{ client: { id: string } }>(await S.api.staff.post("/api/clients", { data: { name: "Matrix erasable client (invented)" } }), "a client to erase", 201);
  S.erasable = made.client.id;
}

/** The owner's client in the demo studio, and a client of the other studio (made once, found after). */
/** The demo studio's conversation about the owner's claim, found in the inbox once. */
async function threadRow(): Promise<void> {
  if (S.threadId) return;
  const inbox = await json<{ threads: { id: string; subjectId: string }[] }>(await S.api.staff.get("/api/threads?view=all"), "the demo studio's inbox", 200);
  S.threadId = inbox.threads.find((t) => t.subjectId === X.ownerClaimId)!.id;
}

async function clientRows(): Promise<void> {
  if (S.clients) return;
  type Page = { rows: { id: string; name: string }[] };
  const demo = (await json<Page>(await S.api.staff.get(`/api/clients?q=${encodeURIComponent(ACCOUNTS.owner)}`), "the owner's client", 200)).rows[0]!;
  const name = "Matrix Client (invented, authorization matrix)";
  const found = (await json<Page>(await S.api.otherStudioStaff.get(`/api/clients?q=${encodeURIComponent("Matrix Client")}`), "the other studio's clients", 200)).rows[0];
  const other = found ?? (await json<{ client: { id: string; name: string } }>(await S.api.otherStudioStaff.post("/api/clients", { data: { name } }), "a client of the other studio", 201)).client;
  S.clients = { demo: { id: demo.id, name: demo.name }, other: { id: other.id, name: other.name } };
}

async function throwawayCareEntry(): Promise<void> {
  const res = await S.api.owner.post(`/api/me/pieces/${X.ownerPieceId}/care-log`, {
    data: { taskKind: "annual_check", surface: "whole_piece", doneOn: X.ownerPieceDeliveredOn, notes: "Matrix throwaway entry (invented)." },
  });
  S.careEntryToDelete = (await json<{ entry: { id: string } }>(res, "logging a throwaway care entry", 201)).entry.id;
}

// ---------------------------------------------------------------- route handlers

/** An APIRequestContext that never follows redirects: a 303 is an answer to check, not to follow. */
type Req = Pick<APIRequestContext, "get" | "post" | "put" | "patch" | "delete">;
function noFollow(api: APIRequestContext): Req {
  type Options = Parameters<APIRequestContext["get"]>[1];
  const wrap = (f: (url: string, o?: Options) => Promise<APIResponse>) => (url: string, o?: Options) => f.call(api, url, { maxRedirects: 0, ...o });
  return { get: wrap(api.get), post: wrap(api.post), put: wrap(api.put), patch: wrap(api.patch), delete: wrap(api.delete) };
}
type RouteCall = { who: Who; api: Req };
type RouteRow = {
  route: string;
  expect: string;
  send: (c: RouteCall) => Promise<APIResponse>;
  before?: () => Promise<void>;
  /** For cells with this status, the error message must match (when the status alone could come from elsewhere). */
  messages?: Partial<Record<string, RegExp>>;
};

const png = { name: "matrix.png", mimeType: "image/png", buffer: Buffer.from("89504e470d0a1a0a", "hex") };
const validLayer = { surface: "top", finishClass: "paste_wax", coats: 1, appliedOn: "2026-02-02" };
const jobQuote = { title: "Matrix check (never saved)", tasks: ["reoil"], productIds: [], coats: 1, travel: false, coveredPct: 0 };
const tooPreciseRepairSettings = {
  roundingRule: "cent",
  taxMode: "single",
  taxInclusive: false,
  taxRates: { labour: "0", materials: "0", travel: "0", other: "0" },
  taxNumber: "",
  priceList: [{ key: "", label: "Matrix task (never saved)", kind: "other", unit: "each", price: "1.005" }],
};
const noCoverPolicy = {
  // A year back: inside the policy date range (ten years back to two ahead), whatever day the suite runs.
  effectiveFrom: new Date(Date.now() - 365 * 86_400_000).toISOString().slice(0, 10),
  lines: Object.fromEntries(
    CLAIM_CATEGORIES.map((c) => [c, { covered: false, label: "", termMonths: 12, exclusions: [], careLogRequired: false, graceDays: 0, onMissed: "not_covered", climateCheck: false, partlyCoveredPct: 50, transfersToNewOwner: false }]),
  ),
};
const visitWindow = () => `from=${encodeURIComponent(future(-20))}&to=${encodeURIComponent(future(20))}`;

// `expect` cells, in WHO order: anonymous owner otherOwner technician staff admin otherStudioStaff
// otherStudioAdmin. A status; "303:/x" a redirect to /x; "-" not sent (only in extra rows of a route
// that already has a full row, where the request would change something for that role).
const ROUTES: RouteRow[] = [
  // Public: the same answer for everyone.
  { route: "GET /home", expect: "303:/sign-in 303:/pieces 303:/pieces 303:/studio/today 303:/studio 303:/studio 303:/studio 303:/studio", send: ({ api }) => api.get("/home") },
  { route: "GET /api/health", expect: "200 ".repeat(8), send: ({ api }) => api.get("/api/health") },
  { route: "GET /api/unsubscribe", expect: "303:/unsubscribe ".repeat(8), send: ({ api }) => api.get("/api/unsubscribe?t=matrix-not-a-real-token") },
  // The signed token is the only authority; a made-up one is refused for everyone alike.
  {
    route: "POST /api/unsubscribe",
    expect: "404 ".repeat(8),
    send: ({ api }) => api.post("/api/unsubscribe?t=matrix-not-a-real-token", { form: { "List-Unsubscribe": "One-Click" } }),
  },
  { route: "POST /api/webhooks/stripe", expect: "400 ".repeat(8), send: ({ api }) => api.post("/api/webhooks/stripe", { data: { id: "evt_matrix" }, headers: { "stripe-signature": "t=1,v1=00" } }) },
  // A studio's own endpoint: the demo studios saved no signing secret, so it answers 404 to everyone.
  { route: "POST /api/webhooks/stripe/studio/[studioId]", expect: "404 ".repeat(8), send: ({ api }) => api.post("/api/webhooks/stripe/studio/matrix-no-such-studio", { data: { id: "evt_matrix" }, headers: { "stripe-signature": "t=1,v1=00" } }) },

  // The signed-in person's own data.
  { route: "GET /api/me", expect: "401 200 200 200 200 200 200 200", send: ({ api }) => api.get("/api/me") },
  { route: "GET /api/me/preferences", expect: "401 200 200 200 200 200 200 200", send: ({ api }) => api.get("/api/me/preferences") },
  { route: "PATCH /api/me/preferences", expect: "401 400 400 400 400 400 400 400", send: ({ api }) => api.patch("/api/me/preferences", { data: {} }) },
  { route: "GET /api/me/pieces", expect: "401 200 200 200 200 200 200 200", send: ({ api }) => api.get("/api/me/pieces") },
  { route: "GET /api/me/pieces/[id]", expect: "401 200 404 404 404 404 404 404", send: ({ api }) => api.get(`/api/me/pieces/${X.ownerPieceId}`) },
  { route: "GET /api/me/pieces/[id]/certificate", expect: "401 200 404 404 404 404 404 404", send: ({ api }) => api.get(`/api/me/pieces/${X.ownerPieceId}/certificate`) },
  // A well-formed entry dated before the delivery: the owner gets past the ownership check to the date check (400).
  {
    route: "POST /api/me/pieces/[id]/care-log",
    expect: "401 400 404 404 404 404 404 404",
    send: ({ api }) => api.post(`/api/me/pieces/${X.ownerPieceId}/care-log`, { data: { taskKind: "annual_check", surface: "whole_piece", doneOn: "1990-01-01" } }),
  },
  {
    route: "PATCH /api/me/pieces/[id]/care-log/[entryId]",
    expect: "401 400 404 404 404 404 404 404",
    send: ({ api }) => api.patch(`/api/me/pieces/${X.ownerPieceId}/care-log/${X.ownerCareLogEntryId}`, { data: { doneOn: "1990-01-01" } }),
  },
  {
    route: "DELETE /api/me/pieces/[id]/care-log/[entryId]",
    expect: "401 200 404 404 404 404 404 404",
    before: throwawayCareEntry,
    send: ({ api }) => api.delete(`/api/me/pieces/${X.ownerPieceId}/care-log/${S.careEntryToDelete}`),
  },
  // The spare piece is registered to the owner just before, and released by the owner (last).
  {
    route: "POST /api/me/pieces/[id]/release",
    expect: "401 200 404 404 404 404 404 404",
    before: registerSpare,
    send: ({ api }) => api.post(`/api/me/pieces/${X.spare.pieceId}/release`, { data: { confirm: true } }),
  },
  // A malformed code is refused before any lookup or rate limit, for any signed-in person.
  { route: "POST /api/registrations", expect: "401 400 400 400 400 400 400 400", send: ({ api }) => api.post("/api/registrations", { data: { code: "not-a-code" } }) },

  // Clients: the studio's staff and admins; another studio's client is a 404, owners and technicians are refused.
  { route: "GET /api/clients", expect: "401 403 403 403 200 200 200 200", send: ({ api }) => api.get("/api/clients?q=walnut&filter=account&sort=updated&page=1") },
  { route: "POST /api/clients", expect: "401 403 403 403 400 400 400 400", send: ({ api }) => api.post("/api/clients", { data: {} }) },
  { route: "GET /api/clients/[id]", expect: "401 403 403 403 200 200 404 404", before: clientRows, send: ({ api }) => api.get(`/api/clients/${S.clients.demo.id}`) },
  { route: "GET /api/clients/[id]", expect: "401 403 403 403 404 404 200 200", before: clientRows, send: ({ api }) => api.get(`/api/clients/${S.clients.other.id}`) },
  // Saves the name it already has: changes nothing for the roles that may.
  { route: "PATCH /api/clients/[id]", expect: "401 403 403 403 200 200 404 404", before: clientRows, send: ({ api }) => api.patch(`/api/clients/${S.clients.demo.id}`, { data: { name: S.clients.demo.name } }) },
  { route: "GET /api/clients/[id]/timeline", expect: "401 403 403 403 200 200 404 404", before: clientRows, send: ({ api }) => api.get(`/api/clients/${S.clients.demo.id}/timeline?limit=5`) },
  { route: "GET /api/clients/export.csv", expect: "401 403 403 403 200 200 200 200", send: ({ api }) => api.get("/api/clients/export.csv?q=a&filter=invited") },
  // Personal data: admins only (another studio's staff are refused by role first); another studio's client is a 404 to its admin. Erasing takes a throwaway client made just before.
  { route: "GET /api/clients/[id]/personal-data", expect: "401 403 403 403 403 200 403 404", before: clientRows, send: ({ api }) => api.get(`/api/clients/${S.clients.demo.id}/personal-data`) },
  { route: "POST /api/clients/[id]/erase", expect: "401 403 403 403 403 200 403 404", before: erasableClient, send: ({ api }) => api.post(`/api/clients/${S.erasable}/erase`, { data: { confirm: true } }) },
  // Bulk hand-over mail: staff and admins; an empty pick is a 400 before anything is written; an unknown mailing a 404.
  { route: "GET /api/clients/handover-batches", expect: "401 403 403 403 200 200 200 200", send: ({ api }) => api.get("/api/clients/handover-batches") },
  { route: "POST /api/clients/handover-batches", expect: "401 403 403 403 400 400 400 400", send: ({ api }) => api.post("/api/clients/handover-batches", { data: { pieceIds: [] } }) },
  { route: "GET /api/clients/handover-batches/[id]", expect: "401 403 403 403 404 404 404 404", send: ({ api }) => api.get("/api/clients/handover-batches/00000000-0000-4000-8000-000000000000") },

  // Claims: the owner who filed it and the studio's staff; nobody else learns it exists.
  { route: "GET /api/claims", expect: "401 200 200 200 200 200 200 200", send: ({ api }) => api.get("/api/claims") },
  {
    route: "POST /api/claims",
    // A claim noticed before its piece was delivered: the owner's piece is found (422 on the date),
    // nobody else's is. (A date past tomorrow is refused for everyone before any lookup, as a 400.)
    expect: "401 422 404 404 404 404 404 404",
    send: ({ api }) =>
      api.post("/api/claims", {
        data: {
          pieceId: X.ownerPieceId,
          category: "crack_gap",
          noticedOn: "1990-01-01",
          description: "Matrix check: this claim is never filed.",
          answers: { heat: "no", chemicals: "no", impact: "no", usedOutdoors: "no", directSun: "no" },
        },
      }),
  },
  { route: "GET /api/claims/[id]", expect: "401 200 404 404 200 200 404 404", send: ({ api }) => api.get(`/api/claims/${X.ownerClaimId}`) },
  // The claim is declined: a decision or a state change is a 409 for its studio's staff.
  {
    route: "POST /api/claims/[id]/decision",
    expect: "401 403 403 403 409 409 404 404",
    send: ({ api }) => api.post(`/api/claims/${X.ownerClaimId}/decision`, { data: { decision: "declined", reason: "Matrix check, never applied." } }),
  },
  { route: "POST /api/claims/[id]/state", expect: "401 403 403 403 409 409 404 404", send: ({ api }) => api.post(`/api/claims/${X.ownerClaimId}/state`, { data: { to: "accepted" } }) },
  // The claim is declined, so its studio's staff get past the guard to the refusal: no job is made.
  {
    route: "POST /api/claims/[id]/job",
    expect: "401 403 403 403 409 409 404 404",
    messages: { "409": /^Only an accepted claim becomes a repair job\.$/ },
    send: ({ api }) => api.post(`/api/claims/${X.ownerClaimId}/job`),
  },
  // requestInfo: the owner may see the claim but not ask for information (403); staff can't reopen a declined claim (409).
  {
    route: "POST /api/claims/[id]/messages",
    expect: "401 403 404 404 409 409 404 404",
    send: ({ api }) => api.post(`/api/claims/${X.ownerClaimId}/messages`, { data: { body: "Matrix check (never sent).", requestInfo: true } }),
  },
  // Photos: only the owner adds or removes them, and only while the claim is open (409 on a declined one).
  // Conversations: owners write on their own claims, jobs and visits (others get 404 before the
  // message is read, so a blank one is the owner's 400); the inbox is the studio's staff's alone.
  { route: "GET /api/threads", expect: "401 403 403 403 200 200 200 200", send: ({ api }) => api.get("/api/threads?view=all") },
  { route: "POST /api/threads", expect: "401 400 404 404 404 404 404 404", send: ({ api }) => api.post(`/api/threads?about=claim&id=${X.ownerClaimId}`, { data: { body: "" } }) },
  { route: "GET /api/threads/[id]", expect: "401 403 403 403 200 200 404 404", before: threadRow, send: ({ api }) => api.get(`/api/threads/${S.threadId}`) },
  { route: "PATCH /api/threads/[id]", expect: "401 403 403 403 200 200 404 404", before: threadRow, send: ({ api }) => api.patch(`/api/threads/${S.threadId}`, { data: { assignedToId: null } }) },
  { route: "POST /api/threads/[id]/messages", expect: "401 403 403 403 400 400 404 404", before: threadRow, send: ({ api }) => api.post(`/api/threads/${S.threadId}/messages`, { data: { body: "" } }) },
  { route: "POST /api/threads/unmatched/[id]/resolve", expect: "401 403 403 403 404 404 404 404", send: ({ api }) => api.post("/api/threads/unmatched/not-a-kept-mail/resolve") },
  { route: "POST /api/claims/[id]/photos", expect: "401 409 404 404 403 403 404 404", send: ({ api }) => api.post(`/api/claims/${X.ownerClaimId}/photos`, { multipart: { file: png } }) },
  { route: "DELETE /api/claims/[id]/photos/[fileId]", expect: "401 409 404 404 403 403 404 404", send: ({ api }) => api.delete(`/api/claims/${X.ownerClaimId}/photos/${X.ownerClaimPhotoId}`) },
  // A claim photo: its owner and the studio's staff (not technicians).
  { route: "GET /api/files/[fileId]", expect: "401 200 404 404 200 200 404 404", send: ({ api }) => api.get(`/api/files/${X.ownerClaimPhotoId}`) },

  // Repair jobs: the studio's staff, and the job's owner once quoted.
  { route: "GET /api/jobs", expect: "401 200 200 200 200 200 200 200", send: ({ api }) => api.get("/api/jobs") },
  { route: "POST /api/jobs", expect: "401 403 403 403 409 409 404 404", send: ({ api }) => api.post("/api/jobs", { data: { from: "claim", id: X.ownerClaimId } }) },
  { route: "GET /api/jobs/[id]", expect: "401 200 404 404 200 200 404 404", send: ({ api }) => api.get(`/api/jobs/${J.paid}`) },
  { route: "PATCH /api/jobs/[id]", expect: "401 403 403 403 409 409 404 404", send: ({ api }) => api.patch(`/api/jobs/${J.done}`, { data: jobQuote }) },
  // The body is the quote the page showed (required); on the paid job it is stale, so the owner's is a 409.
  { route: "POST /api/jobs/[id]/approve", expect: "401 409 404 404 404 404 404 404", send: ({ api }) => api.post(`/api/jobs/${J.paid}/approve`, { data: { quoteVersion: 0, totalMinor: 0 } }) },
  // A done job can't be cancelled, by its owner or by staff, and the refusal comes before any refund is asked for.
  {
    route: "POST /api/jobs/[id]/cancel",
    expect: "401 409 404 404 409 409 404 404",
    messages: { "409": /^(A job that is "Done" can't become "Cancelled"\.|Ask the studio to cancel a job that is already paid or booked\.)$/ },
    send: ({ api }) => api.post(`/api/jobs/${J.done}/cancel`),
  },
  // Money back on a paid job that stays done: the studio's staff and admins only; the stale version sent here moves no money.
  {
    route: "POST /api/jobs/[id]/refund",
    expect: "401 403 403 403 409 409 404 404",
    messages: { "409": /^(The job changed since this page was opened, so nothing was given back\. Reload to see it as it is now\.|This job has no card payment to give money back from\.)$/ },
    send: ({ api }) => api.post(`/api/jobs/${J.done}/refund`, { data: { version: 999_999, refundableMinor: 0, amountMinor: 1, reason: "Checking who may give money back." } }),
  },
  // Finishing a refund the payment service did not confirm: the studio's staff and admins only; none is pending on the done job.
  {
    route: "POST /api/jobs/[id]/refund/[refundId]",
    expect: "401 403 403 403 404 404 404 404",
    messages: { "404": /^(This refund isn't on this job: reload the page\.|No such repair job\.)$/ },
    send: ({ api }) => api.post(`/api/jobs/${J.done}/refund/missing-refund`),
  },
  { route: "POST /api/jobs/[id]/quote", expect: "401 403 403 403 409 409 404 404", send: ({ api }) => api.post(`/api/jobs/${J.done}/quote`) },
  // The receipt PDF of the owner's paid job: its owner and the studio's staff; a technician is neither.
  { route: "GET /api/jobs/[id]/receipt", expect: "401 200 404 404 200 200 404 404", send: ({ api }) => api.get(`/api/jobs/${J.paid}/receipt`) },
  { route: "GET /api/jobs/[id]/slots", expect: "401 200 404 404 200 200 404 404", send: ({ api }) => api.get(`/api/jobs/${J.paid}/slots`) },

  // Visits: staff, the visit's technician, the job's owner. The done visit is Ines's, on the owner's done job.
  { route: "GET /api/visits", expect: "401 200 200 200 200 200 200 200", send: ({ api }) => api.get(`/api/visits?${visitWindow()}`) },
  {
    // Allowed roles send an empty body (400), the others a well-formed booking of the owner's paid job (404).
    route: "POST /api/visits",
    expect: "401 400 404 404 400 400 404 404",
    send: ({ who, api }) =>
      api.post("/api/visits", { data: ["owner", "staff", "admin"].includes(who) ? {} : { jobId: J.paid, technicianId: X.inesId, start: future(10) } }),
  },
  { route: "PATCH /api/visits/[id]", expect: "401 409 404 409 409 409 404 404", send: ({ api }) => api.patch(`/api/visits/${X.doneVisitId}`, { data: { start: future(10) } }) },
  { route: "PATCH /api/visits/[id]", expect: "401 - 404 404 - - 404 404", send: ({ api }) => api.patch(`/api/visits/${X.solBookedVisitId}`, { data: { start: future(10) } }) },
  { route: "POST /api/visits/[id]/cancel", expect: "401 409 404 409 409 409 404 404", send: ({ api }) => api.post(`/api/visits/${X.doneVisitId}/cancel`, { data: {} }) },
  { route: "POST /api/visits/[id]/cancel", expect: "401 - 404 404 - - 404 404", send: ({ api }) => api.post(`/api/visits/${X.solBookedVisitId}/cancel`, { data: {} }) },
  { route: "POST /api/visits/[id]/photos", expect: "401 403 403 400 400 400 404 404", send: ({ api }) => api.post(`/api/visits/${X.doneVisitId}/photos`, { multipart: { kind: "before" } }) },
  { route: "POST /api/visits/[id]/photos", expect: "401 403 403 404 400 400 404 404", send: ({ api }) => api.post(`/api/visits/${X.solBookedVisitId}/photos`, { multipart: { kind: "before" } }) },
  {
    route: "POST /api/visits/[id]/report",
    expect: "401 403 403 409 409 409 404 404",
    send: ({ api }) => api.post(`/api/visits/${X.doneVisitId}/report`, { data: { work: "Matrix check (never filed).", layers: [] } }),
  },
  {
    route: "POST /api/visits/[id]/report",
    expect: "401 403 403 404 - - 404 404",
    send: ({ api }) => api.post(`/api/visits/${X.solBookedVisitId}/report`, { data: { work: "Matrix check (never filed).", layers: [] } }),
  },
  { route: "GET /api/technicians/[id]/hours", expect: "401 403 403 200 200 200 404 404", send: ({ api }) => api.get(`/api/technicians/${X.inesId}/hours`) },
  { route: "GET /api/technicians/[id]/hours", expect: "401 403 403 404 200 200 404 404", send: ({ api }) => api.get(`/api/technicians/${X.solId}/hours`) },
  // Ines's current hours, sent back unchanged: staff may set them, the technician may not.
  { route: "PUT /api/technicians/[id]/hours", expect: "401 403 403 403 200 200 404 404", send: ({ api }) => api.put(`/api/technicians/${X.inesId}/hours`, { data: S.inesHours }) },
  { route: "PUT /api/technicians/[id]/hours", expect: "401 403 403 404 - - 404 404", send: ({ api }) => api.put(`/api/technicians/${X.solId}/hours`, { data: S.inesHours }) },

  // The registry: admin and staff of the piece's studio. T is a throwaway piece made in beforeAll.
  { route: "GET /api/pieces", expect: "401 403 403 403 200 200 200 200", send: ({ api }) => api.get("/api/pieces") },
  { route: "POST /api/pieces", expect: "401 403 403 403 400 400 400 400", send: ({ api }) => api.post("/api/pieces", { data: {} }) },
  { route: "GET /api/pieces/export.csv", expect: "401 403 403 403 200 200 200 200", send: ({ api }) => api.get("/api/pieces/export.csv") },
  { route: "POST /api/pieces/import", expect: "401 403 403 403 400 400 400 400", send: ({ api }) => api.post("/api/pieces/import", { data: {} }) },
  { route: "GET /api/pieces/[id]", expect: "401 403 403 403 200 200 404 404", send: ({ api }) => api.get(`/api/pieces/${F.demoPieceId}`) },
  { route: "GET /api/pieces/[id]", expect: "401 403 403 403 404 404 200 200", send: ({ api }) => api.get(`/api/pieces/${F.otherPieceId}`) },
  { route: "PATCH /api/pieces/[id]", expect: "401 403 403 403 200 200 404 404", before: throwaways, send: ({ api }) => api.patch(`/api/pieces/${S.piece.id}`, { data: { title: S.piece.title } }) },
  {
    route: "DELETE /api/pieces/[id]",
    expect: "401 403 403 403 200 200 404 404", before: throwaways,
    send: ({ who, api }) => api.delete(`/api/pieces/${who === "admin" ? S.pieceToDelete.admin : S.pieceToDelete.staff}`),
  },
  { route: "GET /api/pieces/[id]/card.pdf", expect: "401 403 403 403 200 200 404 404", send: ({ api }) => api.get(`/api/pieces/${F.demoPieceId}/card.pdf`) },
  // Drawer cards in bulk: the demo studio's piece prints for its staff; for the other studio's it is one of someone else's ids, a 404.
  { route: "GET /api/pieces/cards", expect: "401 403 403 403 200 200 404 404", send: ({ api }) => api.get(`/api/pieces/cards?layout=letter&ids=${F.demoPieceId}`) },
  { route: "POST /api/pieces/[id]/layers", expect: "401 403 403 403 201 201 404 404", before: throwaways, send: ({ api }) => api.post(`/api/pieces/${S.piece.id}/layers`, { data: validLayer }) },
  { route: "PATCH /api/pieces/[id]/layers/[layerId]", expect: "401 403 403 403 200 200 404 404", before: throwaways, send: ({ api }) => api.patch(`/api/pieces/${S.piece.id}/layers/${S.layerId}`, { data: { coats: 2 } }) },
  {
    route: "DELETE /api/pieces/[id]/layers/[layerId]",
    expect: "401 403 403 403 200 200 404 404", before: throwaways,
    send: ({ who, api }) => api.delete(`/api/pieces/${S.piece.id}/layers/${who === "admin" ? S.layerToDelete.admin : S.layerToDelete.staff}`),
  },
  // No file in the form: staff of the piece's studio reach the file check (400).
  { route: "POST /api/pieces/[id]/photos", expect: "401 403 403 403 400 400 404 404", before: throwaways, send: ({ api }) => api.post(`/api/pieces/${S.piece.id}/photos`, { multipart: { note: "no file" } }) },
  // The hand-over mail: staff and admins of the piece's studio. The matrix's piece has no buyer, so sending is a 422.
  { route: "GET /api/pieces/[id]/handover", expect: "401 403 403 403 200 200 404 404", before: throwaways, send: ({ api }) => api.get(`/api/pieces/${S.piece.id}/handover`) },
  { route: "POST /api/pieces/[id]/handover", expect: "401 403 403 403 422 422 404 404", before: throwaways, send: ({ api }) => api.post(`/api/pieces/${S.piece.id}/handover`) },
  { route: "POST /api/pieces/[id]/registration-code", expect: "401 403 403 403 200 200 404 404", before: throwaways, send: ({ api }) => api.post(`/api/pieces/${S.piece.id}/registration-code`) },

  // The finish catalog: staff read it, admins change it. P is a throwaway product made in beforeAll.
  { route: "GET /api/catalog", expect: "401 403 403 403 200 200 200 200", send: ({ api }) => api.get("/api/catalog") },
  { route: "POST /api/catalog", expect: "401 403 403 403 403 400 403 400", send: ({ api }) => api.post("/api/catalog", { data: {} }) },
  { route: "PATCH /api/catalog/[id]", expect: "401 403 403 403 403 200 403 404", before: throwaways, send: ({ api }) => api.patch(`/api/catalog/${S.product.id}`, { data: { name: S.product.name } }) },
  { route: "DELETE /api/catalog/[id]", expect: "401 403 403 403 403 200 403 404", before: throwaways, send: ({ api }) => api.delete(`/api/catalog/${S.product.id}`) },
  // Care plans (lib/plans): staff read the studio's templates, an owner the plans that fit their own piece.
  { route: "GET /api/plans", expect: "401 200 404 404 200 200 200 200", send: ({ api }) => api.get(`/api/plans?pieceId=${X.ownerPieceId}`) },
  { route: "POST /api/plans", expect: "401 403 403 403 403 400 403 400", send: ({ api }) => api.post("/api/plans", { data: {} }) },
  { route: "PUT /api/plans/[id]", expect: "401 403 403 403 403 400 403 400", send: ({ api }) => api.put("/api/plans/missing", { data: {} }) },
  { route: "POST /api/plans/checkout", expect: "401 404 404 404 404 404 404 404", send: ({ api }) => api.post("/api/plans/checkout", { data: { pieceId: X.ownerPieceId, templateId: "missing" } }) },
  { route: "POST /api/plans/subscriptions", expect: "401 403 403 403 404 404 404 404", send: ({ api }) => api.post("/api/plans/subscriptions", { data: { pieceId: X.ownerPieceId, templateId: "missing", paidByNote: "Matrix check" } }) },
  { route: "GET /api/plans/subscriptions/[id]", expect: "401 403 403 403 404 404 404 404", send: ({ api }) => api.get("/api/plans/subscriptions/missing") },
  { route: "POST /api/plans/subscriptions/[id]/cancel", expect: "401 403 403 403 404 404 404 404", send: ({ api }) => api.post("/api/plans/subscriptions/missing/cancel", { data: { version: 0, refundMinor: 0 } }) },
  { route: "POST /api/plans/subscriptions/[id]/keep", expect: "401 403 403 403 404 404 404 404", send: ({ api }) => api.post("/api/plans/subscriptions/missing/keep", { data: { version: 0 } }) },
  { route: "POST /api/plans/subscriptions/[id]/held", expect: "401 403 403 403 404 404 404 404", send: ({ api }) => api.post("/api/plans/subscriptions/missing/held", { data: { invoiceId: "missing", resolution: "accept", version: 0, amountMinor: 0, refundMinor: 0 } }) },
  { route: "POST /api/plans/subscriptions/[id]/finish-transfer", expect: "401 403 403 403 404 404 404 404", send: ({ api }) => api.post("/api/plans/subscriptions/missing/finish-transfer") },
  // An owner's own plan: every signed-in person acts as an owner here; a plan that isn't theirs is a 404.
  { route: "POST /api/me/plans/[id]/cancel", expect: "401 404 404 404 404 404 404 404", send: ({ api }) => api.post("/api/me/plans/missing/cancel", { data: { version: 0, refundMinor: 0 } }) },
  { route: "POST /api/me/plans/[id]/keep", expect: "401 404 404 404 404 404 404 404", send: ({ api }) => api.post("/api/me/plans/missing/keep", { data: { version: 0 } }) },

  // Reminders (staff). The reminder was sent, so resending is a 409; pausing sets the value it already has.
  { route: "GET /api/reminders", expect: "401 403 403 403 200 200 200 200", send: ({ api }) => api.get("/api/reminders") },
  { route: "POST /api/reminders/[id]/resend", expect: "401 403 403 403 409 409 404 404", send: ({ api }) => api.post(`/api/reminders/${X.sentReminderId}/resend`) },
  {
    route: "POST /api/reminders/pause",
    expect: "401 403 403 403 200 200 404 404",
    send: ({ api }) => api.post("/api/reminders/pause", { data: { pieceId: X.ownerPieceId, paused: X.ownerPiecePaused } }),
  },

  // The studio's figures (staff) and settings (admins); each acts on the caller's own studio.
  { route: "GET /api/studio/overview", expect: "401 403 403 403 200 200 200 200", send: ({ api }) => api.get("/api/studio/overview") },
  { route: "GET /api/studio/reports/claims.csv", expect: "401 403 403 403 200 200 200 200", send: ({ api }) => api.get("/api/studio/reports/claims.csv") },
  { route: "GET /api/studio/policy", expect: "401 403 403 403 403 200 403 200", send: ({ api }) => api.get("/api/studio/policy") },
  // A version that covers nothing is refused after the admin check (400), so no version is written.
  { route: "POST /api/studio/policy", expect: "401 403 403 403 403 400 403 400", send: ({ api }) => api.post("/api/studio/policy", { data: noCoverPolicy }) },
  { route: "GET /api/studio/settings", expect: "401 403 403 403 403 200 403 200", send: ({ api }) => api.get("/api/studio/settings") },
  { route: "PATCH /api/studio/settings", expect: "401 403 403 403 403 200 403 200", before: throwaways, send: ({ api }) => api.patch("/api/studio/settings", { data: {} }) },
  // The studio's logo (set-up, admins): a form without a file is refused after the admin check; removing none is a no-op.
  {
    route: "POST /api/studio/logo",
    expect: "401 403 403 403 403 400 403 400",
    messages: { "400": /^Attach a photo/ },
    send: ({ api }) => api.post("/api/studio/logo", { multipart: { note: "no file" } }),
  },
  { route: "DELETE /api/studio/logo", expect: "401 403 403 403 403 204 403 204", send: ({ api }) => api.delete("/api/studio/logo") },
  // Public (logos are on e-mails and owners' pages); the seeded studios have none.
  { route: "GET /api/studio-logo/[studioId]", expect: "404 ".repeat(8), send: ({ api }) => api.get(`/api/studio-logo/${X.demoStudioId}`) },
];

async function checkRouteAnswer(row: RouteRow, who: Who, cell: string, res: APIResponse): Promise<string | null> {
  const [want, where] = cell.split(":");
  const status = res.status();
  const text = await res.text().catch(() => "");
  if (String(status) !== want) return `got ${status} (${text.slice(0, 160).replace(/\s+/g, " ")})`;
  if (where) {
    const location = res.headers()["location"] ?? "";
    const path = new URL(location, "http://x").pathname;
    if (path !== where) return `redirected to ${location}, want ${where}`;
  }
  if (status >= 400) {
    let code: unknown;
    try {
      code = (JSON.parse(text) as { error?: { code?: unknown } }).error?.code;
    } catch {
      code = undefined;
    }
    if (typeof code !== "string") return `a ${status} without a JSON error body: ${text.slice(0, 120)}`;
    const pattern = row.messages?.[want!];
    const message = (JSON.parse(text) as { error: { message?: string } }).error.message ?? "";
    if (pattern && !pattern.test(message)) return `a ${status} saying "${message}", want ${pattern}`;
  }
  if (status < 300 && /json|text|csv/.test(res.headers()["content-type"] ?? "")) {
    const leaked = SECRETS[who].filter((s) => text.includes(s));
    if (leaked.length) return `answer ${status} contains rows that are not theirs: ${leaked.join(", ")}`;
  }
  return null;
}

// ---------------------------------------------------------------- server actions

type ActionArgs = { json: unknown[] } | { form: Record<string, string> };
type ActionRow = {
  /** "file#export", as on disk. */
  action: string;
  expect: string;
  args: (who: Who) => ActionArgs;
  /** The message an allowed role gets for the 400/404/409/422 cells of this row. */
  messages?: Partial<Record<string, RegExp>>;
  before?: () => Promise<void>;
  /** Run after every other row (sign-out ends the sessions the other rows use). */
  last?: boolean;
};
type ActionOutcome = { status: number; redirect?: string; result?: { ok: boolean; message?: string; data?: unknown; fieldErrors?: Record<string, string[]> }; raw: string };

// lib/auth/guards.ts and lib/errors.ts: the words of the refusals every guarded action returns.
const ACTION_MESSAGES: Record<string, RegExp> = {
  "401": /^Sign in to continue\.$/,
  "403": /^(This area is for studio members\.|Your role in this studio doesn't include this\.)$/,
  "404": /^No (such|piece|claim|finish product|reminder) |^We don't know that code|has expired, was withdrawn/,
};

const anyPrefs = { remindersEnabled: true, timeZone: "UTC", unitSystem: "metric" };
const newPassword = "matrix-new-password-1";

// `expect` cells, in WHO order: "ok" ({ ok: true }); "401"/"403"/"404" the refusal messages above; another
// status the row's `messages` pattern (or, for "400", field errors); "→/x" a redirect to /x ("/x*": a prefix).
const ACTIONS: ActionRow[] = [
  // Public forms: no session needed and none used; invalid or made-up input, the same answer for all.
  { action: "app/(public)/sign-in/actions.ts#signInAction", expect: "400 ".repeat(8), args: () => ({ json: [{ email: "", password: "" }] }) },
  { action: "app/(public)/sign-up/actions.ts#signUpAction", expect: "400 ".repeat(8), args: () => ({ json: [{ name: "", email: "not-an-email", password: "short" }] }) },
  // Valid input would start a studio for every signed-in role (the e2e server runs with STUDIO_SIGNUP=open); tests/integration/studio-start.test.ts covers who may.
  { action: "app/(public)/start/actions.ts#startStudioAction", expect: "400 ".repeat(8), args: () => ({ json: [{ name: "", timeZone: "Mars/Olympus", currency: "XYZ", unitSystem: "metric" }] }) },
  { action: "app/(public)/forgot-password/actions.ts#forgotPasswordAction", expect: "400 ".repeat(8), args: () => ({ json: [{ email: "not-an-email" }] }) },
  {
    action: "app/(public)/reset-password/actions.ts#resetPasswordAction",
    expect: "400 ".repeat(8),
    messages: { "400": /^This reset link has expired or was already used/ },
    args: () => ({ json: [{ token: "matrix-not-a-real-reset-token", password: newPassword, confirm: newPassword }] }),
  },
  {
    action: "app/(public)/invite/[token]/actions.ts#acceptInvitationAction",
    expect: "404 ".repeat(8),
    args: () => ({ json: [{ token: "matrix-not-a-real-invitation", name: "Nobody (invented)", password: newPassword }] }),
  },
  // The verification link's page posts this; a made-up token confirms nothing, for anyone.
  { action: "app/(public)/verify-email/actions.ts#confirmEmailAction", expect: "→/verify-email/sent ".repeat(8), args: () => ({ form: { token: "matrix-not-a-real-verification-token" } }) },
  // The sign-off link's page posts this; a made-up token signs off nothing, for anyone.
  { action: "app/(public)/visit-sign-off/actions.ts#confirmSignOffAction", expect: "→/visit-sign-off ".repeat(8), args: () => ({ form: { token: "matrix-not-a-real-sign-off-token" } }) },
  { action: "app/(public)/offers/[token]/actions.ts#acceptOfferAction", expect: "→/offers/* ".repeat(8), args: () => ({ form: { token: "matrix-not-a-real-offer-token" } }) },
  { action: "app/(public)/unsubscribe/actions.ts#setRemindersAction", expect: "→/unsubscribe ".repeat(8), args: () => ({ form: { t: "short" } }) },

  // Signed-in person's own account.
  { action: "app/(owner)/account/actions.ts#savePreferencesAction", expect: "401 ok ok ok ok ok ok ok", args: (who) => ({ json: [S.prefs[who] ?? anyPrefs] }) },
  { action: "app/(owner)/account/actions.ts#saveNameAction", expect: "401 ok ok ok ok ok ok ok", args: (who) => ({ json: [{ name: S.names[who] ?? "Nobody (invented)" }] }) },
  {
    action: "app/(owner)/account/password/actions.ts#changePasswordAction",
    expect: "401 400 400 400 400 400 400 400",
    messages: { "400": /^That isn't your current password\.$/ },
    args: () => ({ json: [{ current: "matrix-wrong-password", password: newPassword, confirm: newPassword }] }),
  },
  // Moving one's own account to another address: a wrong current password stops everyone signed in before anything is sent.
  {
    action: "app/(owner)/account/email/actions.ts#requestEmailChangeAction",
    expect: "401 400 400 400 400 400 400 400",
    messages: { "400": /^That isn't your current password\.$/ },
    args: () => ({ json: [{ email: "matrix-moved@owners.example", current: "matrix-wrong-password" }] }),
  },
  // Nothing waiting: each signed-in person cancels nothing of their own.
  { action: "app/(owner)/account/email/actions.ts#cancelEmailChangeAction", expect: "401 ok ok ok ok ok ok ok", args: () => ({ json: [] }) },
  // The mailed link's page posts this; a made-up token changes no one's address.
  { action: "app/(owner)/account/email/confirm/actions.ts#confirmEmailChangeAction", expect: "→/account/email/confirm ".repeat(8), args: () => ({ form: { token: "matrix-not-a-real-change-token" } }) },
  // Deleting one's own account: a wrong password stops it for everyone (staff would be refused after it: team accounts aren't deleted here).
  {
    action: "app/(owner)/account/delete/actions.ts#deleteAccountAction",
    expect: "401 400 400 400 400 400 400 400",
    messages: { "400": /^That isn't your current password\.$/ },
    args: () => ({ json: [{ current: "matrix-wrong-password" }] }),
  },
  { action: "app/(public)/verify-email/sent/actions.ts#resendVerificationAction", expect: "401 ok ok ok ok ok ok ok", args: () => ({ json: [{}] }) },
  // A well-formed code that matches no piece: the signed-in get past the guard to the lookup.
  { action: "app/(owner)/register/actions.ts#registerAction", expect: "401 404 404 404 404 404 404 404", args: () => ({ json: [{ code: generateRegistrationCode() }] }) },
  // A hand-over link nobody was sent: the signed-in get past the guard to the lookup.
  {
    action: "app/(public)/hand-over/[token]/actions.ts#registerByHandoverAction",
    expect: "401 404 404 404 404 404 404 404",
    messages: { "404": /^We don't know that link\./ },
    args: () => ({ json: [{ token: "matrix-not-a-real-hand-over-token" }] }) },
  {
    action: "app/(owner)/pieces/[id]/transfer/actions.ts#releaseAction",
    expect: "401 ok 404 404 404 404 404 404",
    before: registerSpare,
    args: () => ({ json: [X.spare.pieceId, { confirm: true }] }),
  },

  // The studio console.
  {
    action: "app/studio/jobs/actions.ts#createJobAction",
    expect: "401 403 403 403 409 409 404 404",
    messages: { "409": /^Only an accepted claim becomes a repair job\.$/ },
    args: () => ({ json: [{ from: "claim", id: X.ownerClaimId }] }),
  },
  // Admins save the values their studio already has.
  {
    action: "app/studio/settings/actions.ts#saveProfileAction",
    expect: "401 403 403 403 403 ok 403 ok",
    args: (who) => ({ json: [(who === "otherStudioAdmin" ? S.studio.otherStudioAdmin : S.studio.admin).profile] }),
  },
  {
    action: "app/studio/settings/actions.ts#saveReminderTimingAction",
    expect: "401 403 403 403 403 ok 403 ok",
    args: (who) => ({ json: [(who === "otherStudioAdmin" ? S.studio.otherStudioAdmin : S.studio.admin).reminders] }),
  },
  {
    action: "app/studio/settings/actions.ts#saveVisitRulesAction",
    expect: "401 403 403 403 403 ok 403 ok",
    args: (who) => ({ json: [(who === "otherStudioAdmin" ? S.studio.otherStudioAdmin : S.studio.admin).visits] }),
  },
  // A price with more decimals than the currency has: refused after the admin check, nothing saved.
  {
    action: "app/studio/settings/repairs/actions.ts#saveRepairSettingsAction",
    expect: "401 403 403 403 403 400 403 400",
    messages: { "400": /^Matrix task \(never saved\): [A-Z]{3} has \d decimals at most\.$/ },
    args: () => ({ json: [tooPreciseRepairSettings] }),
  },
  {
    action: "app/studio/settings/actions.ts#createPolicyVersionAction",
    expect: "401 403 403 403 403 400 403 400",
    messages: { "400": /^Cover at least one kind of claim\.$/ },
    args: () => ({ json: [noCoverPolicy] }),
  },
  // The set-up's own steps (app/studio/setup/actions.ts). Admins save the colour their studio has (the default).
  { action: "app/studio/setup/actions.ts#saveAccentAction", expect: "401 403 403 403 403 ok 403 ok", args: () => ({ json: [{ accent: "default" }] }) },
  // Both studios' catalogs have entries (made here for the other studio if it has none): 409, nothing added.
  {
    action: "app/studio/setup/actions.ts#startCatalogAction",
    expect: "401 403 403 403 403 409 403 409",
    messages: { "409": /^Your catalog already has entries/ },
    before: async () => {
      const other = await json<{ products: unknown[] }>(await S.api.otherStudioAdmin.get("/api/catalog"), "the other studio's catalog", 200);
      if (other.products.length === 0) await json(await S.api.otherStudioAdmin.post("/api/catalog", { data: { name: "Matrix oil (invented)", finishClass: "hardwax_oil", coverageM2PerL: 20 } }), "a product for the other studio", 201);
    },
    args: () => ({ json: [{}] }),
  },
  // A well-formed key the Stripe fake does not know: refused by Stripe after the admin check, nothing kept.
  {
    action: "app/studio/setup/actions.ts#saveStripeKeyAction",
    expect: "401 403 403 403 403 422 403 422",
    messages: { "422": /^Stripe did not accept that key/ },
    args: () => ({ json: [{ secretKey: "sk_test_matrix_not_the_fakes_key" }] }),
  },
  // A well-formed signing secret: admins keep it for their own studio.
  { action: "app/studio/setup/actions.ts#saveStripeWebhookSecretAction", expect: "401 403 403 403 403 ok 403 ok", args: () => ({ json: [{ webhookSecret: "whsec_matrix_invented" }] }) },
  // Admins save their studio's name as the sender and the reply address it has.
  {
    action: "app/studio/setup/actions.ts#saveMailSenderAction",
    expect: "401 403 403 403 403 ok 403 ok",
    args: (who) => {
      const p = (who === "otherStudioAdmin" ? S.studio.otherStudioAdmin : S.studio.admin).profile as { name: string; email: string };
      return { json: [{ senderName: p.name, replyTo: p.email }] };
    },
  },
  { action: "app/studio/setup/actions.ts#sendTestMessageAction", expect: "401 403 403 403 403 ok 403 ok", args: () => ({ json: [{}] }) },
  // Inviting someone who is already a member of the admin's own studio: 409, and no invitation goes out.
  {
    action: "app/studio/team/actions.ts#inviteAction",
    expect: "401 403 403 403 403 409 403 409",
    messages: { "409": /^That person is already a member of this studio\.$/ },
    args: (who) => ({ json: [{ email: who === "otherStudioAdmin" ? EMAIL.otherStudioStaff : EMAIL.technician, role: "technician" }] }),
  },
  // The technician's role set to the role they have: a no-op for the demo admin, another studio's member for the other.
  {
    action: "app/studio/team/actions.ts#changeRoleAction",
    expect: "401 403 403 403 403 ok 403 404",
    args: () => ({ json: [{ membershipId: X.technicianMembershipId, role: "technician" }] }),
  },
  // The demo admin removing themself is refused (409); the other studio's admin can't see the membership.
  {
    action: "app/studio/team/actions.ts#removeMemberAction",
    expect: "401 403 403 403 403 409 403 404",
    messages: { "409": /^You can't remove yourself/ },
    args: () => ({ json: [{ membershipId: X.adminMembershipId }] }),
  },

  // An invitation id that names nothing: admins get past the guard to the lookup (404), so does the other studio's admin.
  {
    action: "app/studio/team/actions.ts#revokeInvitationAction",
    expect: "401 403 403 403 403 404 403 404",
    args: () => ({ json: [{ invitationId: "matrix-not-a-real-invitation" }] }),
  },

  // Last: signing out ends each of this spec's sessions (checked with /api/me afterwards).
  { action: "app/actions/session.ts#signOutAction", expect: "→/sign-in ".repeat(8), args: () => ({ json: [] }), last: true },
];

const SIGNED_IN_AREAS = ["/studio", "/pieces", "/account"]; // proxy.ts
/**
 * Anonymous with a made-up session cookie, sent as a header on each call (the app clears a bad cookie,
 * which would empty a cookie jar): it passes proxy.ts's cookie-presence check, so the action's own guard answers.
 */
const FORGED_COOKIE = "gw_session=matrix-forged-session-token";

function pagePathFor(action: ManifestAction): string {
  // Any page that carries the action can receive it; prefer one without [params].
  const pages = action.pages.map(pagePattern).sort((a, b) => (a.match(/\[/g)?.length ?? 0) - (b.match(/\[/g)?.length ?? 0));
  return fill(pages[0] ?? "/", (name) => (name === "id" ? X.spare.pieceId : `matrix-not-a-real-${name}`));
}

/** Flight rows "id:json"; row 0 names the action's result row ("a": "$@1"). */
function flightResult(text: string): ActionOutcome["result"] {
  const rows = new Map<string, string>();
  for (const line of text.split("\n")) {
    const m = /^([0-9a-f]+):(.*)$/.exec(line);
    if (m) rows.set(m[1]!, m[2]!);
  }
  const root = rows.get("0");
  if (!root) return undefined;
  const ref = /^\$@([0-9a-f]+)$/.exec((JSON.parse(root) as { a?: string }).a ?? "");
  const row = ref ? rows.get(ref[1]!) : undefined;
  return row ? JSON.parse(row) : undefined;
}

/** The root row "0" goes last, as encodeReply sends it: the server resolves "$K1" from the fields read before it. */
function replyForm(fields: Record<string, string>): FormData {
  const form = new FormData();
  for (const [k, v] of Object.entries(fields)) form.append(`_1_${k}`, v);
  form.append("0", JSON.stringify(["$K1"]));
  return form;
}

async function callAction(api: APIRequestContext, action: ManifestAction, args: ActionArgs, baseURL: string, cookie?: string): Promise<ActionOutcome> {
  const headers: Record<string, string> = { "Next-Action": action.id, Accept: "text/x-component", Origin: new URL(baseURL).origin, ...(cookie ? { Cookie: cookie } : {}) };
  const url = pagePathFor(action);
  // React's encodeReply: plain values are one JSON text; a FormData argument becomes fields "_1_<name>" and root ["$K1"].
  const res =
    "json" in args
      ? await api.post(url, { headers: { ...headers, "Content-Type": "text/plain;charset=UTF-8" }, data: JSON.stringify(args.json), maxRedirects: 0 })
      : await api.post(url, { headers, multipart: replyForm(args.form), maxRedirects: 0 });
  const raw = await res.text();
  const redirect = res.headers()["x-action-redirect"]?.split(";")[0] ?? (res.status() >= 300 && res.status() < 400 ? res.headers()["location"] : undefined);
  let result: ActionOutcome["result"];
  try {
    result = redirect ? undefined : flightResult(raw);
  } catch {
    result = undefined;
  }
  return { status: res.status(), redirect, result, raw };
}

function checkActionOutcome(row: ActionRow, cell: string, o: ActionOutcome): string | null {
  const shown = o.result ? JSON.stringify(o.result) : o.redirect ? `redirect to ${o.redirect}` : `${o.status} ${o.raw.slice(0, 160)}`;
  if (o.status !== 200 && !o.redirect) return `HTTP ${o.status}: ${shown}`;
  if (cell.startsWith("→")) {
    const want = cell.slice(1);
    const path = o.redirect ? new URL(o.redirect, "http://x").pathname : null;
    const hit = path !== null && (want.endsWith("*") ? path.startsWith(want.slice(0, -1)) : path === want);
    return hit ? null : `got ${shown}, want a redirect to ${want}`;
  }
  if (!o.result) return `no action result: ${shown}`;
  if (cell === "ok") return o.result.ok ? null : `got ${shown}, want ok`;
  if (o.result.ok) return `got ok (${JSON.stringify(o.result.data ?? null)}), want ${cell}`;
  const pattern = row.messages?.[cell] ?? ACTION_MESSAGES[cell];
  if (pattern) return pattern.test(o.result.message ?? "") ? null : `got "${o.result.message}", want ${cell} ${pattern}`;
  if (cell === "400") return Object.keys(o.result.fieldErrors ?? {}).length > 0 ? null : `got "${o.result.message}" without field errors, want 400`;
  return `no message pattern for cell ${cell}`;
}

// ---------------------------------------------------------------- setup and teardown

test.beforeAll(async ({ playwright, baseURL }) => {
  test.setTimeout(120_000);
  const api = {} as Api;
  const newContext = () => playwright.request.newContext({ baseURL });
  for (const who of WHO) api[who] = await contextFor(newContext, who, baseURL!);
  S = { api } as State;

  // The values already stored, for the rows that save them back.
  S.prefs = {} as Record<Who, unknown>;
  S.names = {} as Record<Who, string>;
  for (const who of WHO.filter((w) => w !== "anonymous")) {
    const p = (await json<{ preferences: { remindersEnabled: boolean; timeZone: string; unitSystem: string } }>(await api[who].get("/api/me/preferences"), `${who}'s preferences`, 200)).preferences;
    S.prefs[who] = { remindersEnabled: p.remindersEnabled, timeZone: p.timeZone, unitSystem: p.unitSystem };
    S.names[who] = (await json<{ user: { name: string } }>(await api[who].get("/api/me"), `${who}'s account`, 200)).user.name;
  }
  S.studio = {
    admin: await json(await api.admin.get("/api/studio/settings"), "the demo studio's settings", 200),
    otherStudioAdmin: await json(await api.otherStudioAdmin.get("/api/studio/settings"), "the other studio's settings", 200),
  } as State["studio"];
  const hours = await json<{ hours: unknown[]; timeOff: unknown[] }>(await api.staff.get(`/api/technicians/${X.inesId}/hours`), "Ines's hours", 200);
  S.inesHours = { hours: hours.hours, timeOff: hours.timeOff };
});

test.afterAll(async ({ playwright, baseURL }) => {
  // This spec's sessions may be signed out by now: clean up from fresh ones.
  const fresh = (who: SignedIn) => contextFor(() => playwright.request.newContext({ baseURL }), who, baseURL!);
  if (S?.piece) {
    await (await fresh("staff")).delete(`/api/pieces/${S.piece.id}`);
    await (await fresh("admin")).delete(`/api/catalog/${S.product.id}`);
  }
  // A run stopped between registering and releasing the spare piece: hand it back.
  const owner = await fresh("owner");
  if ((await owner.get(`/api/me/pieces/${X.spare.pieceId}`)).ok()) await owner.post(`/api/me/pieces/${X.spare.pieceId}/release`, { data: { confirm: true } });
  await Promise.all(contexts.map((c) => c.dispose()));
});

// ---------------------------------------------------------------- the tests

test("every route handler, method and server action on disk has a row, and every action is in the build", () => {
  const missing: string[] = [];
  const onDisk = new Set<string>();
  for (const r of appRoutes()) {
    if (r.methods.length === 0) missing.push(`${r.file} exports no HTTP method the matrix knows`);
    for (const m of r.methods) onDisk.add(`${m} ${r.pattern}`);
  }
  for (const key of onDisk) {
    const rows = ROUTES.filter((row) => row.route === key);
    if (rows.length === 0) missing.push(`route ${key} has no row in ROUTES`);
    else if (!rows.some((row) => !row.expect.split(/\s+/).includes("-"))) missing.push(`route ${key} has no row with an answer for every role`);
  }
  for (const row of ROUTES) {
    if (!onDisk.has(row.route)) missing.push(`ROUTES row "${row.route}" names no route on disk`);
    parseRow(row.expect, row.route);
  }

  const built = manifestActions();
  const actionsOnDisk = serverActions().map((a) => `${a.file}#${a.name}`);
  for (const key of actionsOnDisk) {
    if (!ACTIONS.some((row) => row.action === key)) missing.push(`server action ${key} has no row in ACTIONS`);
    if (!built.some((b) => `${b.file}#${b.name}` === key)) missing.push(`server action ${key} is not in .next/server/server-reference-manifest.json (rebuild?)`);
  }
  for (const b of built) if (!actionsOnDisk.includes(`${b.file}#${b.name}`)) missing.push(`the build has server action ${b.file}#${b.name} (an inline "use server"?) that no actions file on disk exports`);
  for (const row of ACTIONS) {
    if (!actionsOnDisk.includes(row.action)) missing.push(`ACTIONS row "${row.action}" names no server action on disk`);
    const cells = parseRow(row.expect, row.action);
    if (Object.values(cells).includes("-")) missing.push(`ACTIONS row "${row.action}" must answer for every role`);
  }
  expect(missing, missing.join("\n")).toEqual([]);
  expect(onDisk.size).toBeGreaterThan(50);
  expect(actionsOnDisk.length).toBeGreaterThanOrEqual(20);
});

test("route handlers × roles", async () => {
  test.setTimeout(120_000);
  const failures: string[] = [];
  let sent = 0;
  for (const row of ROUTES) {
    const cells = parseRow(row.expect, row.route);
    await row.before?.();
    for (const who of RUN_ORDER) {
      const cell = cells[who];
      if (cell === "-") continue;
      const res = await row.send({ who, api: noFollow(S.api[who]) });
      sent++;
      const problem = await checkRouteAnswer(row, who, cell, res);
      if (problem) failures.push(`${row.route} as ${who}: ${problem} (want ${cell})`);
    }
  }
  expect(failures, `${failures.length} of ${sent} answers differ:\n${failures.join("\n")}`).toEqual([]);
});

test("server actions × roles", async ({ baseURL }) => {
  test.setTimeout(120_000);
  const built = manifestActions();
  const failures: string[] = [];
  const rows = [...ACTIONS.filter((r) => !r.last), ...ACTIONS.filter((r) => r.last)];
  for (const row of rows) {
    const action = built.find((b) => `${b.file}#${b.name}` === row.action);
    if (!action) {
      failures.push(`${row.action}: not in the build`);
      continue;
    }
    const cells = parseRow(row.expect, row.action);
    const path = pagePathFor(action);
    await row.before?.();
    for (const who of RUN_ORDER) {
      const cell = cells[who]!;
      if (who === "anonymous") {
        // Without any cookie, proxy.ts sends the signed-in areas to sign-in before the action runs.
        const bare = await callAction(S.api.anonymous, action, row.args(who), baseURL!);
        const gated = SIGNED_IN_AREAS.some((p) => path === p || path.startsWith(`${p}/`));
        const problem = gated
          ? bare.status === 307 && bare.redirect?.startsWith("/sign-in")
            ? null
            : `without a cookie: ${bare.status} ${bare.redirect ?? bare.raw.slice(0, 120)}, want proxy.ts's redirect to /sign-in`
          : checkActionOutcome(row, cell, bare);
        if (problem) failures.push(`${row.action} (on ${path}) as anonymous: ${problem}`);
      }
      const outcome = await callAction(S.api[who], action, row.args(who), baseURL!, who === "anonymous" ? FORGED_COOKIE : undefined);
      const problem = checkActionOutcome(row, cell, outcome);
      if (problem) failures.push(`${row.action} (on ${path}) as ${who}${who === "anonymous" ? " (forged cookie)" : ""}: ${problem}`);
    }
  }
  // Signed out: each of this spec's sessions is over.
  for (const who of WHO.filter((w) => w !== "anonymous")) {
    const status = (await S.api[who].get("/api/me")).status();
    if (status !== 401) failures.push(`after signOutAction, ${who}'s session still answers ${status} on /api/me`);
  }
  expect(failures, failures.join("\n")).toEqual([]);
});
