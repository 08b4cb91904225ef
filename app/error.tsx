"use client";

import { StatusPage } from "@/components/shell/status-page";

export default function ErrorPage({ error, reset }: { error: Error & { digest?: string }; reset: () => void }) {
  return (
    <StatusPage code="500" title="Something went wrong">
      <p>The page could not be shown. Nothing you saved has been lost.</p>
      {error.digest && <p className="mono mt-2">Reference: {error.digest}</p>}
      <button type="button" onClick={reset} className="btn-primary mt-4">
        Try again
      </button>
    </StatusPage>
  );
}
