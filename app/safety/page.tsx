import Link from "next/link";
import { SAFETY_NOTES, SAFETY_SHORT } from "@/lib/safety";
import { PapinMark } from "@/components/ui/papin-mark";

export const metadata = { title: "Safety notes" };

export default function SafetyPage() {
  return (
    <main className="mx-auto max-w-3xl px-gutter py-10">
      <Link href="/" className="mb-8 inline-flex items-center gap-2 text-sm text-ink-muted">
        <PapinMark className="h-6 w-6" /> Back to Papin
      </Link>
      <h1>Safety notes</h1>
      <p className="mt-2 text-ink-soft">{SAFETY_SHORT}</p>
      <div className="mt-6 space-y-4">
        {SAFETY_NOTES.map((note) => (
          <section key={note.title} className="panel px-panel py-4">
            <h2 className="text-base">{note.title}</h2>
            <p className="mt-1 text-sm text-ink-soft">{note.text}</p>
          </section>
        ))}
      </div>
    </main>
  );
}
