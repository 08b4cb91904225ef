import { decode, encode, type JWT, type JWTDecodeParams, type JWTEncodeParams } from "next-auth/jwt";

/**
 * next-auth's decode derives the key (HKDF) and decrypts the cookie on every request that reads the session, and its
 * session step encrypts the token again into a new cookie each time. The same cookie always decodes to the same
 * claims, so a decoded cookie is kept until its own expiry (never longer); and when the claims to encode are exactly
 * those of a cookie kept here (the jwt callback changed nothing: lib/auth/session-policy.ts writes the last activity
 * back at most once a minute), that cookie is sent back as it is rather than a new encryption of the same claims.
 * Whether the account may still act is checked against the database on every request all the same
 * (lib/auth/guards.ts).
 */
const MAX_TOKENS = 1000;
const decoded = new Map<string, JWT>();
// claims (with the secret and salt they were sealed under) → the cookie that carries them
const cookieOfClaims = new Map<string, string>();

const claimsKey = (claims: JWT, { secret, salt }: { secret: JWTDecodeParams["secret"]; salt?: string }) =>
  JSON.stringify([String(secret), salt ?? "", Object.entries(claims).sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0))]);

const live = (claims: JWT | undefined): claims is JWT => !!claims && typeof claims.exp === "number" && claims.exp * 1000 > Date.now();

function forget(token: string) {
  const claims = decoded.get(token);
  decoded.delete(token);
  if (!claims) return;
  for (const [key, cookie] of cookieOfClaims) if (cookie === token) cookieOfClaims.delete(key);
}

export async function decodeSessionToken(params: JWTDecodeParams): Promise<JWT | null> {
  const { token } = params;
  if (!token) return null;
  const hit = decoded.get(token);
  if (live(hit)) return { ...hit };
  forget(token);
  const claims = await decode(params);
  if (live(claims ?? undefined)) {
    if (decoded.size >= MAX_TOKENS) forget(decoded.keys().next().value as string);
    decoded.set(token, { ...claims });
    cookieOfClaims.set(claimsKey(claims!, params), token);
  }
  return claims;
}

export async function encodeSessionToken(params: JWTEncodeParams): Promise<string> {
  const same = params.token ? cookieOfClaims.get(claimsKey(params.token, params)) : undefined;
  if (same && live(decoded.get(same))) return same;
  return encode(params);
}
