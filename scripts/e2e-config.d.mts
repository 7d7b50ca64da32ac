// Types for scripts/e2e-config.mjs (imported by playwright.config.ts and tests/e2e/helpers.ts).
export declare const E2E_PORTS: { app: number; smtp: number; sink: number; inbound: number; stripe: number };
export declare const E2E_APP_URL: string;
export declare const E2E_SINK_URL: string;
export declare const E2E_EMPTY_DATABASE: boolean;
export declare const E2E_DATABASE: string;
export declare const E2E_DATA_DIR: string;
