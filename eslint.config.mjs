import next from "eslint-config-next/core-web-vitals";
import nextTs from "eslint-config-next/typescript";

// The directions imports may run (DEVELOPERS.md, "Imports run one way"). A new crossing fails
// `npm run lint`, and so CI. tests/unit/import-rules.test.ts checks that each rule bites.
// Icons have one way too (DEVELOPERS.md, "Rules of the house"): every block's list carries noLucide, since
// a later block's no-restricted-imports replaces an earlier one's for the same file.
const noLucide = {
  group: ["lucide-react", "lucide-react/**"],
  message: "Draw icons with <SpriteIcon name=…> (components/ui/sprite-icon.tsx); lucide-react is read only by scripts/icon-sprite.ts, which writes public/icons/sprite.svg.",
};
const restrict = (...patterns) => ({ "no-restricted-imports": ["error", { patterns: [noLucide, ...patterns] }] });

const noDb = { group: ["@/db", "@/db/**"], message: "Only lib/ (and jobs, seeds, tests) reach the database: call a function in lib/<area>." };
const noApp = { group: ["@/app", "@/app/**"], message: "lib/, db/, jobs/ and emails/ never import app/." };
const noFakes = { group: ["@/lib/fakes", "@/lib/fakes/**", "**/fakes/*"], message: "The local fakes are reached over the network; only tests and scripts import lib/fakes." };
// Modules that a client component may import as values: pure ones without `server-only`.
const serverLib = {
  regex: "^@/lib/(?!care/|format$|validation/|claims/labels$|claims/states$|repairs/states$|repairs/lines$|repairs/repropose$|owner/format$|owner/warranty$|claims/coverage-words$|clients/vocabulary$|plans/price-words$)",
  allowTypeImports: true,
  message: "components/ import server modules as types only (`import type`); pure helpers live in lib/care or the allowed list in eslint.config.mjs.",
};

const GUARD_MESSAGE = "Name the roles in route({ roles }) or action({ roles }) (lib/http); the handler gets the request's actor.";
const guardCalls = [
  { group: ["@/lib/auth/guards"], importNames: ["requireUser", "requireStaff", "requireAdmin", "requireStudioMember", "requireStudioRole"], message: GUARD_MESSAGE },
  { group: ["@/lib/auth/session"], importNames: ["getCurrentSession"], message: GUARD_MESSAGE },
  { group: ["@/lib/auth/actor"], importNames: ["requireActor"], message: GUARD_MESSAGE },
];

const oneAppError = [
  { selector: "NewExpression[callee.name='AppError']", message: "Use a constructor from lib/errors.ts (add one there if none fits)." },
  { selector: "ClassDeclaration[superClass.name='AppError']", message: "Use a constructor from lib/errors.ts; fields beside the error go in its `extra`." },
];
const FORMAT_MESSAGE = "Write money, dates and times through lib/format (formatMoney, formatDate, formatInstant, formatCount…), so every page, mail and PDF reads one way.";
const oneFormatter = [
  { selector: "NewExpression[callee.object.name='Intl'][callee.property.name=/^(NumberFormat|DateTimeFormat)$/]", message: FORMAT_MESSAGE },
  { selector: "CallExpression[callee.object.name='Intl'][callee.property.name=/^(NumberFormat|DateTimeFormat)$/]", message: FORMAT_MESSAGE },
  { selector: "CallExpression[callee.property.name=/^toLocale(Date|Time)?String$/]", message: FORMAT_MESSAGE },
];

const config = [
  ...next,
  ...nextTs,
  { rules: { "@typescript-eslint/no-unused-vars": ["warn", { argsIgnorePattern: "^_", varsIgnorePattern: "^_", ignoreRestSiblings: true }] } },
  { ignores: [".next/**", "node_modules/**", "data/**", "test-results/**", "playwright-report/**", "tests/.tmp/**", "next-env.d.ts"] },
  // Everywhere but scripts/ (where scripts/icon-sprite.ts reads lucide-react's shapes); the blocks below add their directions.
  { files: ["**/*.{js,mjs,cjs,jsx,ts,mts,cts,tsx}"], ignores: ["scripts/**"], rules: restrict() },
  { files: ["app/**"], rules: restrict(noDb, noFakes) },
  // Route handlers and server actions name their roles in route({ roles }) / action({ roles })
  // (lib/http), which resolve the request's Actor once; they never call a guard themselves.
  { files: ["app/**/route.ts", "app/**/actions.ts"], rules: restrict(noDb, noFakes, ...guardCalls) },
  {
    files: ["components/**"],
    rules: restrict(noDb, noFakes, serverLib, {
      regex: "^@/app/(?!actions/|.*/actions$)",
      message: "components/ may import server actions from app/, nothing else there.",
    }),
  },
  { files: ["emails/**"], rules: restrict(noDb, noApp, noFakes) },
  { files: ["lib/**", "db/**", "jobs/**"], ignores: ["lib/fakes/**", "db/seed/**"], rules: restrict(noApp, noFakes) },
  { files: ["db/seed/**"], rules: restrict(noApp, noFakes) },
  {
    files: ["lib/care/**"],
    rules: restrict({ regex: "^(?!\\./)", message: "lib/care is pure: it imports nothing but its own files (./x)." }),
  },
  // One way for each chore (DEVELOPERS.md, "Rules of the house"): errors are made with the constructors
  // in lib/errors.ts, money, dates and times are written by lib/format (lib/care, pure and importing
  // nothing outside itself, keeps its own zone arithmetic and plain decimals), and the browser calls
  // our routes through components/api-client.ts only. (A later block's no-restricted-syntax replaces an
  // earlier one's for the same file, so each block lists every selector that applies to it.)
  {
    files: ["app/**", "components/**", "lib/**", "db/**", "jobs/**", "emails/**"],
    ignores: ["lib/errors.ts", "lib/format/**", "lib/care/**"],
    rules: { "no-restricted-syntax": ["error", ...oneAppError, ...oneFormatter] },
  },
  { files: ["lib/format/**", "lib/care/**"], rules: { "no-restricted-syntax": ["error", ...oneAppError] } },
  {
    files: ["components/**", "app/**/*.tsx"],
    ignores: ["components/api-client.ts"],
    rules: {
      "no-restricted-globals": [
        "error",
        { name: "fetch", message: "Call routes through components/api-client.ts (apiJson, callApi)." },
        { name: "XMLHttpRequest", message: "Upload through components/api-client.ts (uploadForm)." },
      ],
    },
  },
];

export default config;
