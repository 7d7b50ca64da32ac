/** Where the database lives when DATABASE_URL is not set. No side effects: lib/env and scripts read it. */
export const DEFAULT_DATABASE_URL = "./data/grainward.db";
