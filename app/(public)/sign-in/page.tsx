import { redirect } from "next/navigation";
import { SignInForm } from "@/components/auth/sign-in-form";
import { PapinMark } from "@/components/ui/papin-mark";
import { SafetyNotice } from "@/components/shell/safety-notice";
import { currentUser } from "@/lib/auth/guards";
import { demoSignIn } from "@/lib/services/demo";
import { ROLE_LABELS } from "@/lib/domain";
import { signInErrorMessage } from "@/lib/auth/messages";
import { safeCallbackPath } from "@/lib/auth/callback-url";

export const metadata = { title: "Sign in" };
export const dynamic = "force-dynamic";

export default async function SignInPage({ searchParams }: { searchParams: Promise<{ callbackUrl?: string; error?: string }> }) {
  const { callbackUrl, error } = await searchParams;
  if (await currentUser()) redirect(safeCallbackPath(callbackUrl));
  const demo = demoSignIn();
  const initialError = error ? signInErrorMessage(error) : null;
  return (
    <div className="flex min-h-screen flex-col">
      <main className="flex flex-1 items-center justify-center px-gutter py-12">
        <div className="grid w-full max-w-4xl gap-8 md:grid-cols-[1.1fr_1fr]">
          <div className="flex flex-col justify-center">
            <div className="flex items-center gap-3">
              <PapinMark className="h-10 w-10" />
              <span className="text-2xl font-semibold tracking-tight">Papin</span>
            </div>
            <p className="mt-4 text-lg text-ink-soft">Proof that your steam sterilizers work.</p>
            <p className="mt-2 text-sm text-ink-muted">
              Upload the logger file of a test cycle; Papin checks every moment of the plateau against saturated steam, computes the figures the standards define and prepares the record for signature.
            </p>
            {demo && (
              <div className="mt-6 rounded-md border border-brass-100 bg-brass-50 px-4 py-3 text-sm" data-testid="demo-accounts">
                <p className="font-medium text-brass-700">Demo site — fictional data</p>
                <p className="mt-1 text-ink-soft">
                  Every demo account uses the password <code className="mono rounded bg-paper-raised px-1 py-0.5">{demo.password}</code>
                </p>
                <ul className="mt-2 space-y-0.5 text-ink-soft">
                  {demo.accounts.map((u) => (
                    <li key={u.email}>
                      <code className="mono">{u.email}</code> — {ROLE_LABELS[u.role]}
                    </li>
                  ))}
                </ul>
              </div>
            )}
          </div>
          <div className="panel px-panel py-6">
            <h1 className="text-lg">Sign in</h1>
            <SignInForm callbackUrl={safeCallbackPath(callbackUrl)} initialError={initialError} />
          </div>
        </div>
      </main>
      <SafetyNotice />
    </div>
  );
}
