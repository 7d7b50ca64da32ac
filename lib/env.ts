import { z } from "zod";
import { DEFAULT_DATABASE_URL } from "@/db/config";

// One schema for every setting the app, the scheduler and the scripts read. Defaults make the demo
// run on a fresh clone; .env.example lists them. Parsed once, at first import.
const port = z.coerce.number().int().min(0).max(65535);

const envSchema = z.object({
  NODE_ENV: z.enum(["development", "production", "test"]).default("development"),
  APP_URL: z.url().default("http://localhost:3000"),
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
  const host = new URL(env.APP_URL).hostname;
  const local = host === "localhost" || host === "127.0.0.1" || host === "::1";
  if (!local && env.APP_SECRET === envSchema.shape.APP_SECRET.parse(undefined)) {
    throw new Error("Grainward cannot start: set APP_SECRET (32+ random characters) when APP_URL is not localhost");
  }
  return env;
}

export const env = parseEnv();

/** The outbox reads the local SMTP sink: in development, or when a demo/test build turns it on. */
export const outboxEnabled = env.NODE_ENV !== "production" || env.OUTBOX_ENABLED;
