// The one formatter: lengths, areas, volumes and temperatures in the reader's unit system, money for
// the studio's country, dates and times in a named zone. Pure (no server-only import): pages, client
// components, e-mails and PDFs all write through it. eslint.config.mjs keeps Intl formatting here.
export * from "./dates";
export * from "./money";
export * from "./units";
export * from "./words";
export * from "./zones";
