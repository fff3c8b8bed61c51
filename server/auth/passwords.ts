import { hash, verify } from '@node-rs/argon2';

// argon2id is the library's default algorithm.
export const hashPassword = (password: string) => hash(password);

// A real hash of a throw-away value: unknown addresses pay the same verify cost as known ones.
let dummyHash: Promise<string> | null = null;
const dummy = () => (dummyHash ??= hash('not-a-real-password-for-timing'));

export async function verifyPassword(stored: string | null, password: string): Promise<boolean> {
  if (!stored) {
    await verify(await dummy(), password).catch(() => false);
    return false;
  }
  try {
    return await verify(stored, password);
  } catch {
    return false;
  }
}
