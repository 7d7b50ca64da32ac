// Local SMTP sink for development and tests, never production: a stand-in for an outside mail
// server. It accepts every message over plain SMTP, parses it, keeps the last MAX_MESSAGES in memory
// and serves them over a small HTTP read API. The product reaches it only over the network (SMTP
// and HTTP), so nothing here imports app code.
import { randomUUID } from "node:crypto";
import http from "node:http";
import type { AddressInfo } from "node:net";
import { simpleParser, type AddressObject, type ParsedMail } from "mailparser";
import { SMTPServer, type SMTPServerAddress, type SMTPServerSession } from "smtp-server";

export type StoredAttachment = {
  filename: string;
  contentType: string;
  size: number;
  contentBase64: string;
};

export type StoredMessage = {
  id: string;
  /** ISO timestamp of when the sink accepted the message */
  receivedAt: string;
  /** SMTP envelope (MAIL FROM / RCPT TO); includes Bcc recipients */
  envelope: { from: string; to: string[] };
  /** From header as text, e.g. `Grainward <no-reply@grainward.example>` */
  from: string;
  /** Addresses of the To and Cc headers */
  to: string[];
  subject: string;
  text: string;
  html: string;
  /** Header names in lower case; repeated headers joined with ", " */
  headers: Record<string, string>;
  attachments: StoredAttachment[];
  /** The message as received (RFC 5322) */
  raw: string;
};

/** What GET /messages returns per message: everything but the raw source. */
export type MessageSummary = Omit<StoredMessage, "raw">;

export type SmtpSinkOptions = {
  host?: string;
  /** 0 picks a free port */
  smtpPort?: number;
  /** 0 picks a free port */
  httpPort?: number;
  /** How many messages to keep (oldest dropped first). */
  maxMessages?: number;
};

export type SmtpSink = {
  smtpPort: number;
  httpPort: number;
  /** Base URL of the HTTP read API, e.g. http://127.0.0.1:2526 */
  url: string;
  /** Newest first */
  messages(): StoredMessage[];
  clear(): void;
  close(): Promise<void>;
};

const MAX_MESSAGES = 2_000;
const MAX_SIZE_BYTES = 25 * 1024 * 1024;

export async function startSmtpSink({
  host = "127.0.0.1",
  smtpPort = 0,
  httpPort = 0,
  maxMessages = MAX_MESSAGES,
}: SmtpSinkOptions = {}): Promise<SmtpSink> {
  // Oldest first internally; reversed when read.
  let store: StoredMessage[] = [];

  const smtp = new SMTPServer({
    authOptional: true,
    disabledCommands: ["STARTTLS"],
    size: MAX_SIZE_BYTES,
    logger: false,
    banner: "Grainward local SMTP sink (development and tests only)",
    closeTimeout: 2_000,
    onData(stream, session, callback) {
      const chunks: Buffer[] = [];
      stream.on("data", (chunk: Buffer) => chunks.push(chunk));
      stream.on("error", (err) => callback(err));
      stream.on("end", () => {
        if (stream.sizeExceeded) {
          const err = Object.assign(new Error("Message exceeds the 25 MB size limit"), { responseCode: 552 });
          callback(err);
          return;
        }
        const raw = Buffer.concat(chunks);
        simpleParser(raw)
          .then((parsed) => {
            store.push(toStored(parsed, raw, session));
            if (store.length > maxMessages) store = store.slice(store.length - maxMessages);
            callback();
          })
          .catch((err: unknown) => {
            const error = Object.assign(new Error(`Could not parse message: ${String(err)}`), { responseCode: 554 });
            callback(error);
          });
      });
    },
  });

  const api = http.createServer((req, res) => {
    try {
      handle(req, res);
    } catch (err) {
      send(res, 500, { error: String(err) });
    }
  });

  function newestFirst(): StoredMessage[] {
    return [...store].reverse();
  }

  function handle(req: http.IncomingMessage, res: http.ServerResponse) {
    const url = new URL(req.url ?? "/", "http://sink.local");
    const parts = url.pathname.split("/").filter(Boolean);
    const method = req.method ?? "GET";

    if (parts.length === 1 && parts[0] === "health") {
      if (method !== "GET") return send(res, 405, { error: "Method not allowed" });
      return send(res, 200, { ok: true, messages: store.length, smtpPort: actualSmtpPort });
    }
    if (parts[0] !== "messages" || parts.length > 3) return send(res, 404, { error: "Not found" });

    if (parts.length === 1) {
      if (method === "DELETE") {
        store = [];
        return send(res, 200, { ok: true });
      }
      if (method !== "GET") return send(res, 405, { error: "Method not allowed" });
      let list = newestFirst();
      const to = url.searchParams.get("to")?.trim().toLowerCase();
      if (to) list = list.filter((m) => recipients(m).includes(to));
      const since = url.searchParams.get("since");
      if (since) {
        const t = Date.parse(since);
        if (Number.isNaN(t)) return send(res, 400, { error: "since must be an ISO date" });
        list = list.filter((m) => Date.parse(m.receivedAt) >= t);
      }
      return send(res, 200, list.map(summarize));
    }

    if (method !== "GET") return send(res, 405, { error: "Method not allowed" });
    const message = store.find((m) => m.id === parts[1]);
    if (!message) return send(res, 404, { error: "No such message" });
    if (parts.length === 2) return send(res, 200, message);
    if (parts[2] === "raw") {
      res.writeHead(200, { "content-type": "message/rfc822" });
      res.end(message.raw);
      return;
    }
    return send(res, 404, { error: "Not found" });
  }

  let actualSmtpPort = 0;
  actualSmtpPort = await new Promise<number>((resolve, reject) => {
    smtp.once("error", reject);
    smtp.listen(smtpPort, host, () => {
      smtp.off("error", reject);
      resolve((smtp.server.address() as AddressInfo).port);
    });
  });
  // A running server logs later errors instead of crashing the process.
  smtp.on("error", (err) => console.error("[smtp-sink]", err.message));

  let actualHttpPort: number;
  try {
    actualHttpPort = await new Promise<number>((resolve, reject) => {
      api.once("error", reject);
      api.listen(httpPort, host, () => {
        api.off("error", reject);
        resolve((api.address() as AddressInfo).port);
      });
    });
  } catch (err) {
    await new Promise<void>((resolve) => smtp.close(() => resolve()));
    throw err;
  }

  const urlHost = host.includes(":") ? `[${host}]` : host;
  let closed: Promise<void> | undefined;

  return {
    smtpPort: actualSmtpPort,
    httpPort: actualHttpPort,
    url: `http://${urlHost}:${actualHttpPort}`,
    messages: newestFirst,
    clear() {
      store = [];
    },
    close() {
      closed ??= Promise.all([
        new Promise<void>((resolve) => smtp.close(() => resolve())),
        new Promise<void>((resolve) => {
          api.close(() => resolve());
          api.closeAllConnections();
        }),
      ]).then(() => undefined);
      return closed;
    },
  };
}

function summarize(m: StoredMessage): MessageSummary {
  const summary: Partial<StoredMessage> = { ...m };
  delete summary.raw;
  return summary as MessageSummary;
}

function send(res: http.ServerResponse, status: number, body: unknown) {
  const json = JSON.stringify(body);
  res.writeHead(status, { "content-type": "application/json; charset=utf-8", "cache-control": "no-store" });
  res.end(json);
}

/** Every address a message went to, lower-cased: header To/Cc and the SMTP envelope. */
function recipients(m: StoredMessage): string[] {
  return [...m.to, ...m.envelope.to].map((a) => a.toLowerCase());
}

function addresses(field: AddressObject | AddressObject[] | undefined): string[] {
  if (!field) return [];
  const list = Array.isArray(field) ? field : [field];
  const out: string[] = [];
  const walk = (entries: AddressObject["value"]) => {
    for (const e of entries) {
      if (e.address) out.push(e.address);
      if (e.group) walk(e.group);
    }
  };
  for (const obj of list) walk(obj.value);
  return out;
}

/** `Name <address>` (unquoted, for reading) of each From address, comma-separated. */
function formatFrom(field: AddressObject | undefined): string {
  if (!field) return "";
  return field.value
    .map((e) => (e.name && e.address ? `${e.name} <${e.address}>` : (e.address ?? e.name)))
    .join(", ");
}

function envelopeAddress(a: SMTPServerAddress | false): string {
  return a ? a.address : "";
}

function toStored(parsed: ParsedMail, raw: Buffer, session: SMTPServerSession): StoredMessage {
  const headers: Record<string, string> = {};
  for (const { key, line } of parsed.headerLines) {
    const name = key.toLowerCase();
    const colon = line.indexOf(":");
    const value = decodeWords(line.slice(colon + 1).replace(/\r?\n[ \t]+/g, " ").trim());
    headers[name] = headers[name] === undefined ? value : `${headers[name]}, ${value}`;
  }
  return {
    id: randomUUID(),
    receivedAt: new Date().toISOString(),
    envelope: {
      from: envelopeAddress(session.envelope.mailFrom),
      to: session.envelope.rcptTo.map((r) => r.address),
    },
    from: formatFrom(parsed.from),
    to: [...addresses(parsed.to), ...addresses(parsed.cc)],
    subject: parsed.subject ?? "",
    text: parsed.text ?? "",
    html: typeof parsed.html === "string" ? parsed.html : "",
    headers,
    attachments: parsed.attachments.map((a) => ({
      filename: a.filename ?? "",
      contentType: a.contentType,
      size: a.size,
      contentBase64: a.content.toString("base64"),
    })),
    raw: raw.toString("utf8"),
  };
}

/** Decodes RFC 2047 encoded words (=?utf-8?B?...?= / =?utf-8?Q?...?=) in a header value. */
function decodeWords(value: string): string {
  return value
    .replace(/(\?=)\s+(=\?)/g, "$1$2") // whitespace between adjacent encoded words is not shown
    .replace(/=\?([^?]+)\?([BbQq])\?([^?]*)\?=/g, (whole, charset: string, enc: string, data: string) => {
      try {
        const bytes =
          enc.toUpperCase() === "B"
            ? Buffer.from(data, "base64")
            : Buffer.from(
                data.replace(/_/g, " ").replace(/=([0-9A-Fa-f]{2})/g, (_m, hex: string) => String.fromCharCode(parseInt(hex, 16))),
                "latin1",
              );
        return new TextDecoder(charset.split("*")[0]).decode(bytes);
      } catch {
        return whole;
      }
    });
}
