export function actionOrigins(env?: { APP_URL?: string; ALLOWED_ORIGINS?: string }): string[];
export const ACTION_BODY_LIMIT_BYTES: number;
