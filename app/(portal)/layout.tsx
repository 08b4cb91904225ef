import Link from "next/link";
import { requirePageActor } from "@/lib/auth/page-guard";
import { can } from "@/lib/auth/permissions";
import { ROLE_LABELS } from "@/lib/domain";
import { NAV_ITEMS } from "@/components/shell/navigation";
import { NavLinks } from "@/components/shell/nav-links";
import { SignOutButton } from "@/components/shell/sign-out-button";
import { AccountLinks, MobileNav } from "@/components/shell/mobile-nav";
import { SessionActivity } from "@/components/shell/session-activity";
import { SafetyNotice } from "@/components/shell/safety-notice";
import { PapinMark } from "@/components/ui/papin-mark";
import { demoEnabled } from "@/lib/env";

export const dynamic = "force-dynamic";

export default async function PortalLayout({ children }: { children: React.ReactNode }) {
  const user = await requirePageActor();
  const items = NAV_ITEMS.filter((i) => !i.permission || can(user.role, i.permission)).map(({ href, label }) => ({ href, label }));
  return (
    <div className="flex min-h-screen flex-col">
      <SessionActivity />
      <a href="#content" className="sr-only focus:not-sr-only focus:absolute focus:left-2 focus:top-2 focus:z-50 focus:rounded focus:bg-paper-raised focus:px-3 focus:py-2">
        Skip to content
      </a>
      <div className="flex flex-1">
        <aside className="hidden w-60 shrink-0 flex-col border-r border-ink-line bg-paper-raised px-3 py-4 md:flex">
          <Link href="/" className="mb-6 flex items-center gap-2 px-3">
            <PapinMark />
            <span className="text-lg font-semibold tracking-tight">Papin</span>
          </Link>
          <NavLinks items={items} />
          <div className="mt-auto border-t border-ink-line px-3 pt-4 text-sm">
            <AccountLinks name={user.name} role={ROLE_LABELS[user.role]} testIds>
              <SignOutButton />
            </AccountLinks>
          </div>
        </aside>
        <div className="flex min-w-0 flex-1 flex-col">
          <header className="relative flex items-center justify-between gap-3 border-b border-ink-line bg-paper-raised px-gutter py-2 md:hidden">
            <Link href="/" className="flex items-center gap-2 py-1">
              <PapinMark className="h-6 w-6" /> <span className="font-semibold">Papin</span>
            </Link>
            <MobileNav
              items={items}
              account={
                <AccountLinks name={user.name} role={ROLE_LABELS[user.role]}>
                  <SignOutButton />
                </AccountLinks>
              }
            />
          </header>
          {demoEnabled() && <div className="border-b border-brass-100 bg-brass-50 px-gutter py-1 text-xs text-brass-700">Demo site: fictional sterilizers, people and cycles.</div>}
          <main id="content" className="flex-1 px-gutter py-6 lg:px-8">
            {children}
          </main>
          <SafetyNotice />
        </div>
      </div>
    </div>
  );
}
