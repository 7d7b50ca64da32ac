// Request bodies against the production build: every kind of body-reading route (JSON, the payment
// webhook's raw text, a multipart photo upload) answers 413 before reading past its limit, whether
// the client declares a Content-Length or streams chunks without one, and the server's memory does
// not grow by what was sent.
import fs from "node:fs";
import http from "node:http";
import { expect, test, type Browser } from "@playwright/test";
import { ACCOUNTS, PORTS, fixture, signIn } from "./helpers";
import { manifestActions } from "./routes";

const PORT = PORTS.app;
const MB = 1024 * 1024;
/** What each over-limit request offers to send: far past every limit (the largest is a photo's 15 MB). */
const OFFERED = 96 * MB;
/**
 * Memory the server may gain while refusing one request: the route's limit plus room for what a
 * Node process allocates anyway while it answers (buffers, JIT, GC timing). Common practice, no
 * published source: measured at 2-9 MB on this build when nothing is buffered.
 */
const NOISE = 24 * MB;

/** The pid of the process listening on PORT (Linux /proc: the socket inode of the listener), looked up once. */
let listener: number | undefined;
const serverPid = (): number => (listener ??= findServerPid());
function findServerPid(): number {
  const hexPort = PORT.toString(16).toUpperCase().padStart(4, "0");
  const inodes = new Set<string>();
  for (const table of ["/proc/net/tcp", "/proc/net/tcp6"]) {
    for (const line of fs.readFileSync(table, "utf8").split("\n").slice(1)) {
      const cols = line.trim().split(/\s+/);
      if (cols[1]?.endsWith(`:${hexPort}`) && cols[3] === "0A") inodes.add(cols[9]!);
    }
  }
  for (const pid of fs.readdirSync("/proc").filter((d) => /^\d+$/.test(d))) {
    try {
      for (const fd of fs.readdirSync(`/proc/${pid}/fd`)) {
        const m = /^socket:\[(\d+)\]$/.exec(fs.readlinkSync(`/proc/${pid}/fd/${fd}`));
        if (m && inodes.has(m[1]!)) return Number(pid);
      }
    } catch {
      // another user's process, or it ended while we looked
    }
  }
  throw new Error(`no process listens on ${PORT}`);
}

function rss(pid: number): number {
  const m = /VmRSS:\s+(\d+) kB/.exec(fs.readFileSync(`/proc/${pid}/status`, "utf8"));
  return m ? Number(m[1]) * 1024 : 0;
}

type Sent = { status: number; body: string; sent: number; peakGrowth: number };

/**
 * POSTs `prefix` then filler bytes until the server answers or OFFERED bytes are out, as chunks
 * (no Content-Length) or under a declared Content-Length of `declared` bytes. Samples the server's
 * resident memory every 20 ms meanwhile and reports the growth over the value before the request.
 */
async function post(path: string, headers: Record<string, string>, prefix: string, declared?: number, maxSend = OFFERED): Promise<Sent> {
  const pid = serverPid();
  const before = rss(pid);
  let peak = before;
  const sampler = setInterval(() => (peak = Math.max(peak, rss(pid))), 20);
  const result = await new Promise<Omit<Sent, "peakGrowth">>((resolve) => {
    let sent = 0;
    let answered = false;
    const h: Record<string, string | number> = { ...headers, ...(declared === undefined ? { "transfer-encoding": "chunked" } : { "content-length": declared }) };
    const req = http.request({ host: "127.0.0.1", port: PORT, path, method: "POST", headers: h });
    const timer = setTimeout(() => {
      req.destroy();
      resolve({ status: 0, body: "no answer within 30 s", sent });
    }, 30_000);
    req.on("response", (res) => {
      answered = true;
      let body = "";
      res.setEncoding("utf8");
      res.on("data", (c: string) => (body += c));
      res.on("end", () => {
        clearTimeout(timer);
        resolve({ status: res.statusCode ?? 0, body, sent });
        req.destroy();
      });
    });
    // Once the server has answered it may close the socket under a client still writing.
    req.on("error", (e) => {
      if (!answered) {
        clearTimeout(timer);
        resolve({ status: 0, body: String(e), sent });
      }
    });
    const chunk = Buffer.alloc(256 * 1024, 0x61);
    const limit = Math.min(maxSend, declared ?? OFFERED);
    const pump = () => {
      while (!answered && !req.destroyed && sent < limit) {
        const piece = sent === 0 ? Buffer.concat([Buffer.from(prefix), chunk]) : chunk;
        sent += piece.length;
        if (!req.write(piece)) return void req.once("drain", pump);
      }
      // A declared body sent in full ends the request (else Node would hold even the headers back
      // and the server would never answer: the warm-up below, which declares 0 bytes, waited out its
      // 30 s). The held-back case (maxSend under the declared length) keeps it open on purpose.
      if (declared !== undefined && sent >= declared && !req.destroyed) req.end();
    };
    pump();
  });
  clearInterval(sampler);
  peak = Math.max(peak, rss(pid));
  return { ...result, peakGrowth: peak - before };
}

async function sessionCookie(browser: Browser, email: string): Promise<string> {
  const context = await browser.newContext();
  await signIn(await context.newPage(), email);
  const cookie = (await context.cookies()).find((c) => c.name === "gw_session")!;
  await context.close();
  return `gw_session=${cookie.value}`;
}

const BOUNDARY = "----grainward-limit-test";
const multipartHead = (field: string) =>
  `--${BOUNDARY}\r\nContent-Disposition: form-data; name="${field}"; filename="big.jpg"\r\nContent-Type: image/jpeg\r\n\r\n`;

test("over-limit bodies get a 413 before the server buffers them, with or without a Content-Length", async ({ browser }) => {
  test.setTimeout(240_000);
  const staff = await sessionCookie(browser, ACCOUNTS.staff);
  const owner = await sessionCookie(browser, ACCOUNTS.owner);
  const { demoPieceId } = fixture();
  const kinds: { name: string; path: string; limit: number; headers: Record<string, string>; prefix: string }[] = [
    { name: "JSON (registration code)", path: "/api/registrations", limit: 1 * MB, headers: { cookie: owner, "content-type": "application/json" }, prefix: '{"code":"' },
    { name: "webhook (raw text)", path: "/api/webhooks/stripe", limit: 1 * MB, headers: { "content-type": "application/json", "stripe-signature": "t=1,v1=00" }, prefix: '{"id":"evt_x","data":"' },
    { name: "piece photo (multipart)", path: `/api/pieces/${demoPieceId}/photos`, limit: 16 * MB, headers: { cookie: staff, "content-type": `multipart/form-data; boundary=${BOUNDARY}` }, prefix: multipartHead("file") },
    { name: "care-log photo (multipart)", path: `/api/me/pieces/${demoPieceId}/care-log`, limit: 16 * MB, headers: { cookie: owner, "content-type": `multipart/form-data; boundary=${BOUNDARY}` }, prefix: multipartHead("photo") },
  ];
  for (const kind of kinds) {
    // Warm the route (module load, JIT), so the measurement below is of the body alone.
    await post(kind.path, kind.headers, kind.prefix, 0);
    const chunked = await post(kind.path, kind.headers, kind.prefix);
    const lying = await post(kind.path, kind.headers, kind.prefix, 10_000 * MB);
    for (const [how, r] of [["chunked", chunked], ["huge Content-Length", lying]] as const) {
      console.log(`${kind.name}, ${how}: ${r.status} after ${(r.sent / MB).toFixed(1)} MB sent, server memory +${(r.peakGrowth / MB).toFixed(1)} MB`);
      expect(r.status, `${kind.name}, ${how}: ${r.body.slice(0, 200)}`).toBe(413);
      expect(JSON.parse(r.body).error.code, `${kind.name}, ${how}`).toBe("payload_too_large");
      expect(r.peakGrowth, `${kind.name}, ${how}: memory growth`).toBeLessThan(kind.limit + NOISE);
    }
    // A declared Content-Length over the limit is refused before the body is read: the client sends
    // the first 256 kB and then waits; a server that waited for the rest would never answer.
    const early = await post(kind.path, kind.headers, kind.prefix, 10_000 * MB, 256 * 1024);
    expect(early.status, `${kind.name}, declared over the limit, body held back: ${early.body.slice(0, 200)}`).toBe(413);
  }
});

test("a server action declaring a body over the actions' 256 kB is a 413 in the one error shape, not a 500", async () => {
  const signIn = manifestActions().find((a) => a.file === "app/(public)/sign-in/actions.ts" && a.name === "signInAction")!;
  const headers = { "next-action": signIn.id, accept: "text/x-component", "content-type": "text/plain;charset=UTF-8", origin: `http://127.0.0.1:${PORT}` };
  const prefix = '[{"email":"limit@test.example","next":"/","password":"';
  // Just over the limit, and 2 MB (past the 512 kB Next.js copies of a page request's body for the
  // proxy, next.config.mjs proxyClientMaxBodySize), each sent whole: whole 256 kB chunks after the prefix.
  const whole = (chunks: number) => Buffer.byteLength(prefix) + chunks * 256 * 1024;
  for (const [how, declared] of [["just over", whole(1)], ["2 MB", whole(8)]] as const) {
    const r = await post("/sign-in", headers, prefix, declared);
    expect(r.status, `${how}: ${r.body.slice(0, 200)}`).toBe(413);
    expect(JSON.parse(r.body).error, how).toEqual({ code: "payload_too_large", message: "That is too large: we take up to 256 KB at a time. Send a smaller one." });
  }
  // Without a Content-Length (chunked), 300 kB sent whole: measured by the proxy, the same 413.
  const chunked = await new Promise<{ status: number; body: string }>((resolve, reject) => {
    const req = http.request({ host: "127.0.0.1", port: PORT, path: "/sign-in", method: "POST", headers: { ...headers, "transfer-encoding": "chunked" } }, (res) => {
      let body = "";
      res.setEncoding("utf8");
      res.on("data", (c: string) => (body += c));
      res.on("end", () => resolve({ status: res.statusCode ?? 0, body }));
    });
    req.on("error", reject);
    req.write(prefix);
    for (let i = 0; i < 6; i++) req.write(Buffer.alloc(50 * 1024, 0x61));
    req.end('"}]');
  });
  expect(chunked.status, `chunked: ${chunked.body.slice(0, 200)}`).toBe(413);
  // Under the limit the action answers as usual: a refusal of the sign-in, not an error.
  const res = await fetch(`http://127.0.0.1:${PORT}/sign-in`, { method: "POST", headers, body: `${prefix}${"a".repeat(200 * 1024)}"}]` });
  expect(res.status).toBe(200);
  expect(await res.text()).toContain('"ok":false');
});

test("a server action sent arguments React never sends is a 400 in the one error shape, not a 500; what React sends still works", async () => {
  const signIn = manifestActions().find((a) => a.file === "app/(public)/sign-in/actions.ts" && a.name === "signInAction")!;
  const call = (body: string | FormData, contentType?: string) =>
    fetch(`http://127.0.0.1:${PORT}/sign-in`, {
      method: "POST",
      redirect: "manual",
      headers: { "next-action": signIn.id, accept: "text/x-component", origin: `http://127.0.0.1:${PORT}`, ...(contentType ? { "content-type": contentType } : {}) },
      body,
    });
  const junkForm = new FormData();
  junkForm.append("0", "{");
  const noRoot = new FormData();
  noRoot.append("_1_email", "limit@test.example");
  for (const [what, body, type] of [
    ["broken JSON", "{", "text/plain;charset=UTF-8"],
    ["a string", '"x"', "text/plain;charset=UTF-8"],
    ["null", "null", "text/plain;charset=UTF-8"],
    ["a broken multipart body", "--b\r\nx\r\n--b--", "multipart/form-data; boundary=b"],
    ["a form whose root is broken JSON", junkForm, undefined],
    ["a form without its root", noRoot, undefined],
  ] as const) {
    const res = await call(body, type);
    expect(res.status, what).toBe(400);
    expect((await res.json()).error, what).toEqual({ code: "bad_request", message: "We could not read that request. Reload the page and try again." });
  }
  // React's own encodings: a JSON array, and a form with its root field; the action answers (a refused sign-in).
  const asJson = await call(JSON.stringify([{ email: "limit@test.example", password: "not-the-password", next: "/" }]), "text/plain;charset=UTF-8");
  expect(asJson.status).toBe(200);
  expect(await asJson.text()).toContain('"ok":false');
  const form = new FormData();
  form.append("_1_email", "limit@test.example");
  form.append("_1_password", "not-the-password");
  form.append("0", JSON.stringify(["$K1"]));
  const asForm = await call(form);
  expect(asForm.status).toBe(200);
  expect(await asForm.text()).toContain('"ok":false');
});
