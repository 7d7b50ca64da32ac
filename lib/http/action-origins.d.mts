export function actionOrigins(env?: { APP_URL?: string; ALLOWED_ORIGINS?: string }): string[];
