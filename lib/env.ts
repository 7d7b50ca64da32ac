import { z } from "zod";
import { DEFAULT_DATABASE_URL } from "@/db/config";

// One schema for every setting the app, the scheduler and the scripts read. Defaults make the demo
// run on a fresh clone; .env.example lists them. Parsed once, at first import.
const port = z.coerce.number().int().min(0).max(65535);

const envSchema = z.object({
  NODE_ENV: z.enum(["development", "production", "test"]).default("development"),
  APP_URL: z.url().default("http://localhost:3000"),
  /**
   * Other addresses this install answers at (a second domain name, its address on the studio's own
   * network), comma-separated origins such as `https://care.example.com,http://192.168.1.20:3000`.
   * Forms and API calls from pages at APP_URL or one of these are accepted; others are refused with
   * a message naming APP_URL. next.config.mjs gives the same list to Next.js for server actions.
   */
  ALLOWED_ORIGINS: z
    .string()
    .default("")
    .transform((v, ctx) => {
      const out: string[] = [];
      for (const item of v.split(",").map((s) => s.trim()).filter(Boolean)) {
        let url: URL | undefined;
        try {
          url = new URL(item);
        } catch {}
        if (!url || !/^https?:$/.test(url.protocol) || url.origin !== item.replace(/\/$/, "")) {
          ctx.addIssue({ code: "custom", message: `"${item}" is not an origin: write it as https://name[:port], without a path` });
          return z.NEVER;
        }
        out.push(url.origin);
      }
      return out;
    }),
  DATABASE_URL: z.string().min(1).default(DEFAULT_DATABASE_URL),
  DATA_DIR: z.string().min(1).default("./data"),
  APP_SECRET: z
    .string()
    .min(32, "APP_SECRET must be at least 32 characters")
    .default("grainward-demo-secret-not-for-production-use"),
  SMTP_HOST: z.string().min(1).default("127.0.0.1"),
  SMTP_PORT: port.default(2525),
  MAIL_FROM: z.string().min(3).default("Grainward <no-reply@grainward.example>"),
  /** HTTP read API of the local SMTP sink; only the development outbox uses it. */
  MAIL_SINK_URL: z.url().default("http://127.0.0.1:2526"),
  /** Owners' e-mailed replies: the inbound SMTP listener (lib/mail/inbound.ts) and the domain of the reply addresses. */
  INBOUND_SMTP_HOST: z.string().min(1).default("127.0.0.1"),
  INBOUND_SMTP_PORT: port.default(2527),
  INBOUND_MAIL_DOMAIN: z.string().min(3).default("reply.grainward.localhost"),
  /** Stripe: the real SDK; in development and tests it reaches the local fake (lib/fakes/stripe-fake.ts). */
  STRIPE_SECRET_KEY: z.string().startsWith("sk_", "STRIPE_SECRET_KEY starts with sk_").default("sk_test_grainward_demo"),
  STRIPE_WEBHOOK_SECRET: z.string().startsWith("whsec_", "STRIPE_WEBHOOK_SECRET starts with whsec_").default("whsec_grainward_demo"),
  /** Empty host = Stripe's own API. */
  STRIPE_API_HOST: z.string().default("127.0.0.1"),
  STRIPE_API_PORT: port.default(12111),
  STRIPE_API_PROTOCOL: z.enum(["http", "https"]).default("http"),
  /** Window of the sign-in, registration-code and reset rate limits, in seconds (tests shorten it). */
  RATE_LIMIT_WINDOW_SEC: z.coerce.number().int().min(1).max(86_400).default(900),
  /**
   * How many proxies in front of the app to believe in X-Forwarded-For (0: none, the socket's peer is
   * the client). Set it to the number of reverse proxies that append to the header, no more.
   */
  TRUST_PROXY: z.coerce.number().int().min(0).max(10).default(0),
  /**
   * Who may start a new studio at /start: anyone with an account (open), holders of an operator's
   * signed invite link (invite, see scripts/studio-invite.ts), or nobody (closed). On an install with
   * no studio at all the first visitor may always start one.
   */
  STUDIO_SIGNUP: z.enum(["open", "invite", "closed"]).default("closed"),
  /** Shows the outbox in production builds too (demo and tests run a production build). */
  OUTBOX_ENABLED: z
    .enum(["true", "false"])
    .default("false")
    .transform((v) => v === "true"),
});

export type Env = z.infer<typeof envSchema>;

function parseEnv(): Env {
  const parsed = envSchema.safeParse(process.env);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((i) => `  ${i.path.join(".")}: ${i.message}`);
    throw new Error(`Grainward cannot start: invalid environment variables\n${lines.join("\n")}`);
  }
  const env = parsed.data;
  const problems = isLocalHost(new URL(env.APP_URL).hostname) ? [] : demoSettingsInUse(env);
  if (problems.length) {
    throw new Error(`Grainward cannot start: APP_URL (${env.APP_URL}) is not localhost, but these are the demo's settings:\n${problems.map((p) => `  ${p}`).join("\n")}`);
  }
  return env;
}

/** localhost, 127.0.0.0/8, ::1 (URL hostnames keep IPv6 in brackets). */
function isLocalHost(host: string): boolean {
  const h = host.replace(/^\[|\]$/g, "").toLowerCase();
  return h === "localhost" || h.endsWith(".localhost") || h === "::1" || /^127(\.\d{1,3}){3}$/.test(h);
}

/**
 * What a deployment off localhost must not keep from the demo: the published secrets, and the Stripe
 * client pointed at the local fake. Each line says what to set instead.
 */
function demoSettingsInUse(env: Env): string[] {
  const demo = (key: "APP_SECRET" | "STRIPE_SECRET_KEY" | "STRIPE_WEBHOOK_SECRET") => env[key] === envSchema.shape[key].parse(undefined);
  const out: string[] = [];
  if (demo("APP_SECRET")) out.push("APP_SECRET is the demo secret: set APP_SECRET to 32 or more random characters (for example the output of `openssl rand -base64 48`).");
  if (demo("STRIPE_SECRET_KEY")) out.push("STRIPE_SECRET_KEY is the demo key: set it to your Stripe account's secret key (sk_live_… or sk_test_…).");
  if (demo("STRIPE_WEBHOOK_SECRET")) out.push("STRIPE_WEBHOOK_SECRET is the demo secret: set it to the signing secret of your Stripe webhook endpoint (whsec_…).");
  if (env.STRIPE_API_HOST && isLocalHost(env.STRIPE_API_HOST)) {
    out.push(`STRIPE_API_HOST points at the local Stripe fake (${env.STRIPE_API_HOST}): set STRIPE_API_HOST to an empty value to reach Stripe's own API.`);
  }
  return out;
}

export const env = parseEnv();

/** The outbox reads the local SMTP sink: in development, or when a demo/test build turns it on. */
export const outboxEnabled = env.NODE_ENV !== "production" || env.OUTBOX_ENABLED;
