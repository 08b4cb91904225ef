import { StatusPage } from "@/components/shell/status-page";

export default function Forbidden() {
  return (
    <StatusPage code="403" title="Not for your role">
      <p data-testid="forbidden">Your account&apos;s role does not give access to this page. If you need it, ask an administrator.</p>
    </StatusPage>
  );
}
