/**
 * Password strength (ASVS 2.1): a new password of at least 12 characters (the shared
 * schema) is also checked against common passwords, dictionary words, keyboard patterns
 * and the user's own name and address by zxcvbn-ts (score 3 of 4 required, "safely
 * unguessable"), with the estimator's own warning as the reason shown beside the field.
 */
import { ZxcvbnFactory } from '@zxcvbn-ts/core'
import * as common from '@zxcvbn-ts/language-common'
import * as en from '@zxcvbn-ts/language-en'
import { InvalidError } from './errors'

/** zxcvbn score a new password needs (0 too guessable ... 4 very unguessable). */
export const MIN_PASSWORD_SCORE = 3

let estimator: ZxcvbnFactory | undefined
function zxcvbn(): ZxcvbnFactory {
  estimator ??= new ZxcvbnFactory({ dictionary: { ...common.dictionary, ...en.dictionary }, graphs: common.adjacencyGraphs, translations: en.translations })
  return estimator
}

/** Why the password is too easy to guess, or null when it is strong enough. */
export function passwordWeakness(password: string, userInputs: string[] = []): string | null {
  const r = zxcvbn().check(password, userInputs.filter(Boolean).flatMap((s) => [s, ...s.split(/[@.\s_-]+/)]))
  if (r.score >= MIN_PASSWORD_SCORE) return null
  const why = r.feedback.warning ?? 'it is too easy to guess'
  const hint = r.feedback.suggestions[0]
  return `password is too easy to guess: ${why.replace(/\.$/, '')}${hint ? `. ${hint}` : ''}`
}

/** 400 naming `field` when the password is too easy to guess. */
export function requireStrongPassword(password: string, userInputs: string[] = [], field = 'password'): void {
  const weak = passwordWeakness(password, userInputs)
  if (weak) throw InvalidError.of([field], weak)
}
