/**
 * Password rules for new accounts, invitations and resets (issue 11 §1): at least 12 characters (a passphrase of a
 * few words is the easiest way there), at most 128, and not guessable — refused when the whole password is on the
 * common-password list shipped by @zxcvbn-ts/language-common, or when zxcvbn scores it below 3 ("safely
 * unguessable" starts at 3 in zxcvbn's scale: Wheeler 2016, USENIX Security, "zxcvbn: Low-Budget Password Strength
 * Estimation", §3). Server-side: the dictionaries are large, so the browser only checks the length.
 */
import { ZxcvbnFactory } from "@zxcvbn-ts/core";
import * as common from "@zxcvbn-ts/language-common";

import { passwordLengthProblem } from "./password-length";

export { PASSWORD_MAX, PASSWORD_MIN, passwordLengthProblem } from "./password-length";
/** zxcvbn score from which a password is accepted (0 too guessable … 4 very unguessable). */
export const MIN_SCORE = 3;

let factory: ZxcvbnFactory | null = null;
function zxcvbn(): ZxcvbnFactory {
  factory ??= new ZxcvbnFactory({ dictionary: { ...common.dictionary }, graphs: common.adjacencyGraphs });
  return factory;
}

/**
 * Why a password is refused, or null when it is accepted. `userInputs` (e-mail, name, project) are words that must
 * not make up the password either.
 */
export function passwordProblem(password: string, userInputs: string[] = []): string | null {
  const length = passwordLengthProblem(password);
  if (length) return length;
  const words = userInputs.flatMap((u) => {
    const parts = u.toLowerCase().split(/[^\p{L}\p{N}]+/u).filter((w) => w.length >= 3);
    return [...parts, parts.join("")];
  });
  const result = zxcvbn().check(password, words);
  const whole = result.sequence.find((m) => m.pattern === "dictionary" && "dictionaryName" in m && m.dictionaryName === "passwords-common" && m.i === 0 && m.j === password.length - 1);
  if (whole) return "This password is on a list of commonly used passwords; choose another (a passphrase of unrelated words works well).";
  if (result.score < MIN_SCORE) {
    const parts = result.sequence
      .filter((m) => m.pattern !== "bruteforce")
      .map((m) => `"${m.token}"`)
      .slice(0, 4);
    return `This password is too easy to guess${parts.length ? ` (it is built from common words, names or patterns: ${parts.join(", ")})` : ""}; make it longer or use unrelated words.`;
  }
  return null;
}
