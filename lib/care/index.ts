// The care engine's public API (sources of its figures: lib/care/SOURCES.md). Pure TypeScript: no framework, database or npm imports.
export * from "./vocabulary";
export * from "./errors";
export * from "./units";
export * from "./dates";
export * from "./area";
export * from "./moisture";
export * from "./shrinkage";
export * from "./species";
export * from "./movement";
export * from "./quantity";
export * from "./intervals";
export * from "./schedule";
export * from "./coverage";
export * from "./quote";
export * from "./slots";
export * from "./registration-code";
