// Slow password hashing with argon2id (@node-rs/argon2: prebuilt, no install script).
import { hash, verify } from '@node-rs/argon2';

// Argon2id with the library's defaults (19 MiB, 2 passes) — the OWASP-recommended minimum.
export function hashPassword(password: string): Promise<string> {
  return hash(password);
}

// Compared against when the e-mail is unknown, so a wrong e-mail costs as long as a wrong password.
let decoy: Promise<string> | null = null;

export async function verifyPassword(passwordHash: string | null, password: string): Promise<boolean> {
  if (!passwordHash) {
    decoy ??= hash('beadroll-decoy-password');
    await verify(await decoy, password);
    return false;
  }
  try {
    return await verify(passwordHash, password);
  } catch {
    return false;
  }
}
