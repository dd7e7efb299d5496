/**
 * What a new password must be: at least 12 characters, at most 72 bytes (bcrypt reads no
 * further), and hard to guess by the zxcvbn estimator (@zxcvbn-ts/core with the common and
 * English dictionaries, after Wheeler 2016, "zxcvbn: Low-Budget Password Strength
 * Estimation"), which catches repeats, sequences, keyboard walks, dates and common
 * passwords that a length rule lets through ("1111111111", "password1234"). The person's
 * own e-mail and name count as guessable too. Every refusal names its rule.
 */
import { ZxcvbnFactory } from '@zxcvbn-ts/core'
import * as zxcvbnCommon from '@zxcvbn-ts/language-common'
import * as zxcvbnEnglish from '@zxcvbn-ts/language-en'
import { z } from 'zod'
import { validationFailed } from '../errors'

const PASSWORD_MIN_LENGTH = 12
/** bcrypt reads only the first 72 bytes of a password; longer ones would be silently cut. */
export const PASSWORD_MAX_BYTES = 72
/** zxcvbn scores 0–4; 3 is "safely unguessable: moderate protection from offline slow-hash scenario" (zxcvbn's own scale). */
const PASSWORD_MIN_SCORE = 3

/** The shape rules, as a zod field named `field` (password or newPassword). */
export function newPasswordField(field = 'password') {
  return z
    .string({ error: (iss) => (iss.input === undefined ? `${field} is required` : `${field} must be text`) })
    .refine((v) => [...v].length >= PASSWORD_MIN_LENGTH, { message: `${field} must be at least ${PASSWORD_MIN_LENGTH} characters` })
    .refine((v) => Buffer.byteLength(v, 'utf8') <= PASSWORD_MAX_BYTES, {
      message: `${field} must be at most ${PASSWORD_MAX_BYTES} bytes (bcrypt uses only the first ${PASSWORD_MAX_BYTES})`,
    })
}

let estimator: ZxcvbnFactory | undefined
function zxcvbn(): ZxcvbnFactory {
  // building the dictionaries takes a moment; once per process
  estimator ??= new ZxcvbnFactory({
    dictionary: { ...zxcvbnCommon.dictionary, ...zxcvbnEnglish.dictionary },
    graphs: zxcvbnCommon.adjacencyGraphs,
    translations: zxcvbnEnglish.translations,
  })
  return estimator
}

interface StrengthVerdict {
  score: number
  /** Why it is weak and what would help, in the estimator's words; '' when strong enough. */
  advice: string
}

async function ratePassword(password: string, personalWords: string[] = []): Promise<StrengthVerdict> {
  // the estimator's cost grows with length; past 100 characters nothing changes the verdict
  const words = personalWords.flatMap((w) => w.toLowerCase().split(/[^\p{L}\p{N}]+/u)).filter((w) => w.length >= 3)
  const result = await zxcvbn().check(password.slice(0, 100), words)
  const advice = [result.feedback.warning, ...result.feedback.suggestions].filter(Boolean).join(' ')
  return { score: result.score, advice }
}

/** Throws 400 validation_failed naming `field` when the password is too easy to guess. */
export async function assertStrongPassword(password: string, personalWords: string[], field = 'password'): Promise<void> {
  const { score, advice } = await ratePassword(password, personalWords)
  if (score >= PASSWORD_MIN_SCORE) return
  const message = `${field} is too easy to guess (rated ${score} of 4 by the strength check; at least ${PASSWORD_MIN_SCORE} needed)${advice ? `: ${advice}` : ''}`
  throw validationFailed([{ field, message }])
}
