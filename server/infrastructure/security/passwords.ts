// argon2id hashing with the configured cost (OWASP parameters in production; cheaper only when a test asks).
import argon2 from 'argon2'
import type { PasswordHashing } from '../../config'

export interface PasswordHasher {
  hash(password: string): Promise<string>
  verify(hash: string, password: string): Promise<boolean>
}

export function createPasswordHasher(cost: PasswordHashing): PasswordHasher {
  return {
    hash: (password) => argon2.hash(password, { type: argon2.argon2id, ...cost }),
    async verify(hash, password) {
      try {
        return await argon2.verify(hash, password)
      } catch {
        return false
      }
    },
  }
}
