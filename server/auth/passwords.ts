import { hash, verify } from '@node-rs/argon2';

/**
 * argon2id (the library's default algorithm) with its default cost: 19 MiB, 2 passes, the
 * minimum OWASP's Password Storage Cheat Sheet recommends for argon2id.
 */
export function createPasswordHasher() {
  let dummyHash: Promise<string> | null = null;
  return {
    hash: (password: string) => hash(password),
    verify: (passwordHash: string, password: string) => verify(passwordHash, password).catch(() => false),
    /**
     * Verifies against a throwaway hash, so an unknown e-mail costs the same time as a wrong
     * password and the answer's timing does not tell which it was.
     */
    async verifyDummy(password: string) {
      dummyHash ??= hash('meander-dummy-password-for-timing');
      await verify(await dummyHash, password).catch(() => false);
      return false as const;
    },
  };
}

export type PasswordHasher = ReturnType<typeof createPasswordHasher>;
