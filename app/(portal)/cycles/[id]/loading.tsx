export default function LoadingCycleRecord() {
  return (
    <div aria-busy="true" aria-live="polite" className="animate-pulse">
      <p className="sr-only">Loading the cycle record…</p>
      <div className="mb-2 h-4 w-32 rounded bg-paper-sunk" />
      <div className="mb-6 h-7 w-72 rounded bg-paper-sunk" />
      <div className="grid gap-gutter xl:grid-cols-[minmax(0,1fr)_20rem]">
        <div className="min-w-0 space-y-gutter">
          <div className="panel h-40" />
          <div className="panel h-[520px]" />
          <div className="panel h-[520px]" />
        </div>
        <div className="space-y-gutter">
          <div className="panel h-48" />
          <div className="panel h-32" />
        </div>
      </div>
    </div>
  );
}
