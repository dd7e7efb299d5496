/**
 * Is a signing secret or access token good enough to guard production? A secret an
 * attacker can guess lets them forge sign-in tokens for any account, so a short one, one
 * made of whitespace or one repeated character, or one with little variety (say "abab…")
 * is refused. Variety is measured as Shannon entropy of the characters (bits per character
 * times length, Shannon 1948). A symmetric key should carry 128 bits (NIST SP 800-57 Part 1),
 * but the per-character estimate undercounts random text over a small alphabet (32 random
 * hex digits hold 128 bits and score about 120), so the floor is set at 96: it refuses
 * patterns, never a secret from `openssl rand`. The estimate is generous to a typed phrase,
 * which is why the length rule comes first.
 */
const MIN_SECRET_BITS = 96

/** Shannon entropy of the string's characters, in bits for the whole string. */
function shannonBits(value: string): number {
  const chars = [...value]
  const counts = new Map<string, number>()
  for (const c of chars) counts.set(c, (counts.get(c) ?? 0) + 1)
  let perChar = 0
  for (const n of counts.values()) {
    const p = n / chars.length
    perChar -= p * Math.log2(p)
  }
  return perChar * chars.length
}

/** Why the secret is too weak ("must be …"), or null when it will do. */
export function describeWeakSecret(secret: string, minLength: number): string | null {
  if (secret.trim() === '') return 'is only whitespace'
  if (secret !== secret.trim()) return 'starts or ends with whitespace (often a copy-and-paste slip)'
  if ([...secret].length < minLength) return `must be at least ${minLength} characters (it has ${[...secret].length})`
  if (new Set(secret).size === 1) return 'is one character repeated'
  const bits = shannonBits(secret)
  if (bits < MIN_SECRET_BITS) return `is too predictable (about ${Math.floor(bits)} bits of variety; at least ${MIN_SECRET_BITS} needed)`
  return null
}
