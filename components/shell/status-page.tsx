import Link from "next/link";
import { PapinMark } from "@/components/ui/papin-mark";

export function StatusPage({ code, title, children }: { code: string; title: string; children: React.ReactNode }) {
  return (
    <main className="flex min-h-screen items-center justify-center px-gutter">
      <div className="max-w-md text-center">
        <PapinMark className="mx-auto h-10 w-10" />
        <p className="mono mt-4 text-ink-muted">{code}</p>
        <h1 className="mt-1">{title}</h1>
        <div className="mt-2 text-sm text-ink-soft">{children}</div>
        <p className="mt-6">
          <Link href="/" className="btn-secondary">
            Back to the overview
          </Link>
        </p>
      </div>
    </main>
  );
}
