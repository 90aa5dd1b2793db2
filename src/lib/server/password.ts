import { hash, verify } from '@node-rs/argon2';

// argon2id with the library defaults (memory 19 MiB, 2 passes): the OWASP password-storage
// baseline. The package ships prebuilt bindings inside its npm packages, so nothing compiles.
export function hashPassword(plain: string): Promise<string> {
  return hash(plain);
}

export async function verifyPassword(hashed: string, plain: string): Promise<boolean> {
  try {
    return await verify(hashed, plain);
  } catch {
    return false;
  }
}
