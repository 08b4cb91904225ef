import type { CycleDetail } from "@/lib/cycles/contracts";
import type { Role } from "@/lib/auth/roles";

export function SignOffPanel({ detail }: { detail: CycleDetail; actor: { id: string; role: Role; name: string } }) {
  return (
    <section className="panel px-panel py-4" aria-label="Sign-off">
      <h2 className="text-base">Sign-off</h2>
      <p className="mt-1 text-sm text-ink-muted">{detail.signatures.length} signature(s).</p>
    </section>
  );
}
