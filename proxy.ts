import { getToken } from "next-auth/jwt";
import { NextResponse, type NextRequest } from "next/server";
import { env, secureCookies } from "@/lib/env";
import { foreignOriginRefusal } from "@/lib/request-origin";

// Server actions and page posts from another site are refused here with a 403; Next itself would throw (a 500).
// Otherwise convenience only: sends anonymous visitors of portal pages to sign-in. Every page, route
// handler and server action still checks the session and the role on the server itself.
const PUBLIC_PREFIXES = ["/sign-in", "/safety", "/api", "/_next", "/favicon"];

export async function proxy(request: NextRequest) {
  const refusal = foreignOriginRefusal(request);
  if (refusal) return new NextResponse(refusal, { status: 403, headers: { "Content-Type": "text/plain; charset=utf-8" } });
  const { pathname, search } = request.nextUrl;
  if (PUBLIC_PREFIXES.some((p) => pathname.startsWith(p))) return NextResponse.next();
  const secret = env().NEXTAUTH_SECRET;
  // Without an environment secret (development) the token cannot be read here; the layout redirects.
  if (!secret) return NextResponse.next();
  const token = await getToken({ req: request, secret, secureCookie: secureCookies() });
  if (token) return NextResponse.next();
  const url = request.nextUrl.clone();
  url.pathname = "/sign-in";
  url.search = pathname === "/" ? "" : `?callbackUrl=${encodeURIComponent(pathname + search)}`;
  return NextResponse.redirect(url);
}

export const config = { matcher: ["/((?!api/|_next/static|_next/image|.*\\.(?:png|svg|ico|woff2?)$).*)"] };
