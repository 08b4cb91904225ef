export const SIGN_IN_ERRORS = {
  CredentialsSignin: "That e-mail and password do not match an account.",
  AccountDisabled: "This account is disabled. Ask an administrator to re-enable it.",
  SessionRequired: "Please sign in to continue.",
} as const;
