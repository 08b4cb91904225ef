import Link from "next/link";
import { requirePageAccount } from "@/lib/auth/page-guard";
import { PASSWORD_RULES_TEXT } from "@/lib/auth/password-rules";
import { OwnPasswordForm } from "@/components/account/own-password-form";
import { PapinMark } from "@/components/ui/papin-mark";
import { SafetyNotice } from "@/components/shell/safety-notice";
import { SignOutButton } from "@/components/shell/sign-out-button";

export const metadata = { title: "Your password" };
export const dynamic = "force-dynamic";

export default async function OwnPasswordPage() {
  const { actor, mustChangePassword: oneTime } = await requirePageAccount("account:own-password");
  return (
    <div className="flex min-h-screen flex-col">
      <main className="flex flex-1 items-center justify-center px-gutter py-12">
        <div className="panel w-full max-w-md px-panel py-6">
          <div className="mb-4 flex items-center gap-2">
            <PapinMark className="h-7 w-7" />
            <span className="text-lg font-semibold tracking-tight">Papin</span>
          </div>
          <h1 className="text-lg">{oneTime ? "Choose your own password" : "Change your password"}</h1>
          <p className="mt-1 text-sm text-ink-soft">
            {oneTime
              ? `${actor.name}, your account has a one-time password from an administrator. Choose your own before you use Papin; until then nothing else opens and nothing can be signed.`
              : `${actor.name} (${actor.email}). Changing the password ends every session of your account.`}
          </p>
          <p className="mt-2 text-xs text-ink-muted">{PASSWORD_RULES_TEXT}</p>
          <OwnPasswordForm email={actor.email} />
          <p className="mt-4 flex justify-between text-sm">
            {oneTime ? (
              <span />
            ) : (
              <Link href="/" className="text-steam-700 underline underline-offset-2">
                Back to the overview
              </Link>
            )}
            <SignOutButton />
          </p>
        </div>
      </main>
      <SafetyNotice />
    </div>
  );
}
