import { dictionary } from "@zxcvbn-ts/language-common";
import { verifyPassword } from "./password";

export const PASSWORD_MIN_LENGTH = 12;
/** A new password may not repeat any of this many earlier ones (the current one included). */
export const PASSWORD_HISTORY_DEPTH = 5;

export const PASSWORD_RULES_TEXT = `At least ${PASSWORD_MIN_LENGTH} characters; not a common password; not containing your e-mail name; not one of your last ${PASSWORD_HISTORY_DEPTH} passwords.`;

let common: Set<string> | undefined;
// zxcvbn-ts's list of frequently used passwords (a maintained package), lower-cased once.
const commonPasswords = () => (common ??= new Set(dictionary["passwords-common"].map((p) => p.toLowerCase())));

function isCommon(password: string): boolean {
  const lower = password.toLowerCase();
  // "Summertime2024" is "summertime" with a year: the trailing digits add little.
  const withoutTrailingDigits = lower.replace(/\d+$/, "");
  return commonPasswords().has(lower) || (withoutTrailingDigits !== "" && commonPasswords().has(withoutTrailingDigits));
}

/**
 * Why a password a person chose for themselves is refused, as one plain sentence; null when it is acceptable.
 * `earlierHashes` are the argon2 hashes of their current and recent passwords. No I/O: the caller loads them.
 */
export async function passwordRuleProblem({ password, email, earlierHashes }: { password: string; email: string; earlierHashes: readonly string[] }): Promise<string | null> {
  if (password.length < PASSWORD_MIN_LENGTH) return `The password must have at least ${PASSWORD_MIN_LENGTH} characters.`;
  if (password.length > 200) return "The password must have at most 200 characters.";
  if (isCommon(password)) return "That password is on a list of commonly used passwords; choose another.";
  const localPart = email.split("@")[0]?.trim().toLowerCase() ?? "";
  if (localPart.length >= 3 && password.toLowerCase().includes(localPart)) return "The password must not contain the name part of your e-mail address.";
  for (const hash of earlierHashes.slice(0, PASSWORD_HISTORY_DEPTH)) {
    if (await verifyPassword(hash, password)) return `The password must differ from your last ${PASSWORD_HISTORY_DEPTH} passwords.`;
  }
  return null;
}
