import next from "eslint-config-next/core-web-vitals";
import nextTs from "eslint-config-next/typescript";

const config = [
  ...next,
  ...nextTs,
  { ignores: [".next/**", "node_modules/**", "data/**", "test-results/**", "playwright-report/**", "tests/.tmp/**", "next-env.d.ts"] },
];

export default config;
