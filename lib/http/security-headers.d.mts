export function securityHeaders(opts: { appUrl: string | undefined; dev: boolean }): { key: string; value: string }[];
