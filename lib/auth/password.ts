import { hash, verify } from "@node-rs/argon2";

// argon2id with the OWASP ASVS 5.0 appendix C minimum: m = 19456 KiB, t = 2, p = 1. The PHC string
// (algorithm, parameters, salt and hash) is stored whole, so parameters can be raised later.
export const ARGON2_OPTIONS = {
  algorithm: 2, // Algorithm.Argon2id (a const enum, which isolatedModules cannot import)
  memoryCost: 19456, // KiB
  timeCost: 2,
  parallelism: 1,
} as const;

export function hashPassword(password: string): Promise<string> {
  return hash(password, ARGON2_OPTIONS);
}

// A real hash of a random password, verified against when the e-mail is unknown, so that an unknown
// e-mail and a wrong password take about the same time.
const DUMMY_HASH = "$argon2id$v=19$m=19456,t=2,p=1$0QOYhq0NX+GRHK5aim7rkw$gXhx3PZDhrHV5DjBR45MWYAzKGkWIY/nWe7G2L8H/94";

export async function verifyPassword(storedHash: string | null | undefined, password: string): Promise<boolean> {
  try {
    return await verify(storedHash ?? DUMMY_HASH, password);
  } catch {
    return false;
  }
}
