import NextAuth from "next-auth";
import { authOptions } from "@/lib/auth/options";

export const runtime = "nodejs";

type Context = { params: Promise<{ nextauth: string[] }> };

async function handler(request: Request, context: Context) {
  const params = await context.params;
  return NextAuth(request as never, { params } as never, authOptions());
}

export { handler as GET, handler as POST };
