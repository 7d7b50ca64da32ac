import { hash, verify } from "@node-rs/argon2";

// OWASP Password Storage Cheat Sheet, Argon2id minimum: m = 19 MiB, t = 2, p = 1.
const options = { memoryCost: 19_456, timeCost: 2, parallelism: 1, outputLen: 32 } as const;

export function hashPassword(password: string): Promise<string> {
  return hash(password, options);
}

export async function verifyPassword(passwordHash: string, password: string): Promise<boolean> {
  try {
    return await verify(passwordHash, password);
  } catch {
    return false;
  }
}

// Compared against when the e-mail is unknown, so both answers take the same time.
let dummyHash: Promise<string> | undefined;
export async function verifyAgainstDummy(password: string): Promise<false> {
  dummyHash ??= hashPassword("grainward-timing-equalizer");
  await verifyPassword(await dummyHash, password);
  return false;
}
