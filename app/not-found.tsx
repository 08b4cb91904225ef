import { StatusPage } from "@/components/shell/status-page";

export default function NotFound() {
  return (
    <StatusPage code="404" title="Nothing here">
      This address does not lead to a page or record. It may have been typed wrongly, or the record belongs to another site.
    </StatusPage>
  );
}
