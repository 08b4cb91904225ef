import { decode, type JWT, type JWTDecodeParams } from "next-auth/jwt";

/**
 * next-auth's decode derives the key (HKDF) and decrypts the cookie on every request that reads the session. The same
 * cookie always decodes to the same claims, so a decoded cookie is kept until its own expiry (never longer); whether
 * the account may still act is checked against the database on every request all the same (lib/auth/guards.ts).
 */
const MAX_TOKENS = 1000;
const decoded = new Map<string, JWT>();

export async function decodeSessionToken(params: JWTDecodeParams): Promise<JWT | null> {
  const { token } = params;
  if (!token) return null;
  const hit = decoded.get(token);
  if (hit && typeof hit.exp === "number" && hit.exp * 1000 > Date.now()) return { ...hit };
  decoded.delete(token);
  const claims = await decode(params);
  if (claims && typeof claims.exp === "number") {
    if (decoded.size >= MAX_TOKENS) decoded.delete(decoded.keys().next().value as string);
    decoded.set(token, { ...claims });
  }
  return claims;
}
