/**
 * Password rules for single-factor sign-in, after NIST SP 800-63B-4 §3.1.1.2 and OWASP ASVS 5.0 V6.2:
 * at least 15 characters counted in Unicode code points, at least 64 allowed (we cap at 1,024 to bound
 * request size), NFKC-normalised, never truncated, no composition rules, and refused when the whole
 * password is a commonly used one or is built from a context word (product name, study titles, the
 * user's own e-mail). Pure: the common-password list is passed in, so the client can use the length
 * rule without shipping the list.
 */
export const PASSWORD_MIN_CODE_POINTS = 15
export const PASSWORD_MAX_CODE_POINTS = 1024

export function normalisePassword(password: string): string {
  return password.normalize('NFKC')
}

export function codePointLength(text: string): number {
  return [...text].length
}

export interface PasswordCheckInput {
  password: string
  /** words from the context: product name, study titles, the user's e-mail address */
  contextWords?: readonly string[]
  /** a set of commonly used passwords, lower-case */
  commonPasswords?: ReadonlySet<string>
}

/** Returns the reasons a password is refused; an empty list means it is acceptable. */
export function passwordProblems({ password, contextWords = [], commonPasswords }: PasswordCheckInput): string[] {
  const normalised = normalisePassword(password)
  const length = codePointLength(normalised)
  const problems: string[] = []
  if (length < PASSWORD_MIN_CODE_POINTS) {
    problems.push(
      `Use at least ${PASSWORD_MIN_CODE_POINTS} characters (this one has ${length}). A few unrelated words make a long password that is easy to remember.`,
    )
  }
  if (length > PASSWORD_MAX_CODE_POINTS) {
    problems.push(`Use at most ${PASSWORD_MAX_CODE_POINTS} characters.`)
  }
  const folded = squash(normalised)
  if (commonPasswords?.has(normalised.toLowerCase()) || (folded && commonPasswords?.has(folded))) {
    problems.push('This password is on a list of commonly used passwords, so it is among the first an attacker would try. Choose another.')
  }
  if (length >= PASSWORD_MIN_CODE_POINTS && isRepetitiveOrSequential(normalised)) {
    problems.push('This password is a repeated or sequential pattern (like "aaaa…" or "1234…"), which is quick to guess. Choose something less regular.')
  }
  for (const word of contextWords) {
    for (const variant of contextVariants(word)) {
      if (variant.length >= 4 && isBuiltFrom(folded, variant)) {
        problems.push(`This password is built from "${word}", which is easy to guess in this setting. Choose something unrelated.`)
        return problems
      }
    }
  }
  return problems
}

/**
 * Repetitive (one short unit repeated, "abcabcabc…") or sequential (each character one after the
 * previous, "123456…", "abcdef…"): NIST SP 800-63B rev. 3 §5.1.1.2 names both among the values to refuse.
 */
export function isRepetitiveOrSequential(password: string): boolean {
  const chars = [...password.toLowerCase()]
  for (let unit = 1; unit <= 4; unit++) {
    if (chars.every((c, i) => c === chars[i % unit])) return true
  }
  const codes = chars.map((c) => c.codePointAt(0)!)
  const steps = codes.slice(1).map((c, i) => c - codes[i]!)
  // "1234567890" wraps 9 → 0; treat that step as sequential too
  const isStep = (d: number, dir: 1 | -1) => d === dir || (dir === 1 && d === -9) || (dir === -1 && d === 9)
  return steps.every((d) => isStep(d, 1)) || steps.every((d) => isStep(d, -1))
}

/** lower-case, letters and digits only */
function squash(text: string): string {
  return text.normalize('NFKC').toLowerCase().replace(/[^\p{L}\p{N}]+/gu, '')
}

function contextVariants(word: string): string[] {
  const variants = new Set<string>([squash(word)])
  const at = word.indexOf('@')
  if (at > 0) variants.add(squash(word.slice(0, at)))
  return [...variants].filter(Boolean)
}

/**
 * "Built from" a context word: the password, once the word is removed, has little of its own left
 * (under 8 code points of other letters or digits) — e.g. "Heardwell2026!!" or the study title
 * repeated. A long passphrase that merely contains the word is accepted (whole-string rule).
 */
function isBuiltFrom(squashedPassword: string, squashedWord: string): boolean {
  if (!squashedPassword.includes(squashedWord)) return false
  const rest = squashedPassword.split(squashedWord).join('')
  return codePointLength(rest.replace(/\d+/g, (d) => (d.length > 4 ? d : ''))) < 8
}
