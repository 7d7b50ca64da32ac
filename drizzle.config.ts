import { defineConfig } from "drizzle-kit";
import { DEFAULT_DATABASE_URL } from "./db/config";

export default defineConfig({
  dialect: "sqlite",
  schema: "./db/schema.ts",
  out: "./db/migrations",
  dbCredentials: { url: process.env.DATABASE_URL ?? DEFAULT_DATABASE_URL },
});
