/** The length rule of passwords, without dictionaries, so that forms in the browser can check it too. */
export const PASSWORD_MIN = 12;
export const PASSWORD_MAX = 128;

/** Why a password's length is refused, or null. Counted in code points (an emoji counts once). */
export function passwordLengthProblem(password: string): string | null {
  const n = [...password].length;
  if (n < PASSWORD_MIN) return `Use at least ${PASSWORD_MIN} characters (yours has ${n}); a passphrase of three or four unrelated words is easy to remember.`;
  if (n > PASSWORD_MAX) return `Use at most ${PASSWORD_MAX} characters.`;
  return null;
}
