export default function Loading() {
  return (
    <div role="status" aria-label="Loading the intake form">
      <h1>New test cycle</h1>
      <div className="mt-6 h-40 animate-pulse rounded-panel border border-ink-line bg-paper-sunk/60" />
      <div className="mt-gutter h-56 animate-pulse rounded-panel border border-ink-line bg-paper-sunk/60" />
    </div>
  );
}
