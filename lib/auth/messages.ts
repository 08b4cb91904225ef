/*
 * Sign-in refusals travel from next-auth to the form as short codes (they also appear in the sign-in page's URL,
 * which anyone can write, so only these codes are ever shown, never text from the URL). A code may carry a time:
 * "AccountLocked|<ISO instant>|<site time zone>" or "SignInDelay|<seconds>".
 */
export const SIGN_IN_ERRORS = {
  CredentialsSignin: "That e-mail and password do not match an account.",
  AccountDisabled: "This account is disabled. Ask an administrator to re-enable it.",
  SessionRequired: "Please sign in to continue.",
  AccountLocked: "Too many failed sign-ins: this account is locked for a while; ask an administrator to unlock it.",
  AddressLocked: "Too many failed sign-ins from this network: sign-in is locked for a while; ask an administrator.",
  SignInDelay: "Too many failed sign-ins in a row: wait a few seconds before trying again.",
} as const;

const GENERIC = "Sign-in failed. Please try again.";

export const lockedCode = (kind: "AccountLocked" | "AddressLocked", untilIso: string, timeZone: string | null) => [kind, untilIso, timeZone ?? ""].join("|");
export const delayCode = (seconds: number) => `SignInDelay|${Math.ceil(seconds)}`;

function clock(instant: Date, timeZone: string): string | null {
  try {
    return new Intl.DateTimeFormat("en-GB", { hour: "2-digit", minute: "2-digit", hourCycle: "h23", timeZone }).format(instant);
  } catch {
    return null;
  }
}

/** The sentence for a code from next-auth or the URL; unknown codes get a generic sentence. */
export function signInErrorMessage(code: string | null | undefined): string {
  if (!code) return GENERIC;
  const [kind, ...rest] = code.split("|");
  if (kind === "SignInDelay") {
    const seconds = Number(rest[0]);
    return Number.isInteger(seconds) && seconds > 0 && seconds <= 3600 ? `Too many failed sign-ins in a row: wait ${seconds} s before trying again.` : SIGN_IN_ERRORS.SignInDelay;
  }
  if (kind === "AccountLocked" || kind === "AddressLocked") {
    const until = new Date(rest[0] ?? "");
    const utc = Number.isNaN(until.getTime()) ? null : clock(until, "UTC");
    if (!utc) return SIGN_IN_ERRORS[kind];
    const local = rest[1] && rest[1] !== "UTC" ? clock(until, rest[1]) : null;
    const when = local ? `${local} site time (${utc} UTC)` : `${utc} UTC`;
    const who = kind === "AccountLocked" ? "this account is locked" : "sign-in from this network is locked";
    return `Too many failed sign-ins: ${who} until ${when}; ask an administrator to unlock it.`;
  }
  return Object.hasOwn(SIGN_IN_ERRORS, kind) ? SIGN_IN_ERRORS[kind as keyof typeof SIGN_IN_ERRORS] : GENERIC;
}

/** What an account still on its one-time password hears from every page action, API call and signature. */
export const CHOOSE_OWN_PASSWORD_FIRST = "Choose your own password first: your account still has the one-time password an administrator set (go to /account/password).";
