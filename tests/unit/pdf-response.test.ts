// Every PDF Papin serves (cycle and study reports, archived copies, audit extracts) goes out through pdfResponse: never
// cached by the browser or a proxy, named by its report number (RFC 6266), shown inline or downloaded.
import { describe, expect, it } from "vitest";
import { pdfResponse } from "@/lib/http";

describe("pdfResponse", () => {
  it("downloads by default, never cached, with the bytes unchanged", async () => {
    const bytes = new TextEncoder().encode("%PDF-1.7 test");
    const res = pdfResponse(bytes, "PR-MB-PL-0417-20261202-ABC123.pdf");
    expect(res.headers.get("content-type")).toBe("application/pdf");
    expect(res.headers.get("cache-control")).toBe("private, no-store");
    expect(res.headers.get("content-disposition")).toBe("attachment; filename=PR-MB-PL-0417-20261202-ABC123.pdf");
    expect(new Uint8Array(await res.arrayBuffer())).toEqual(bytes);
  });

  it("shows a report inline when asked, keeping a non-ASCII name exact and adding Papin's own headers", () => {
    const res = pdfResponse(new Uint8Array([37, 80, 68, 70]), "DRAFT-L1–007.pdf", { inline: true, headers: { "X-Papin-Report": "draft" } });
    expect(res.headers.get("content-disposition")).toMatch(/^inline; filename="DRAFT-L1\?007\.pdf"; filename\*=UTF-8''DRAFT-L1%E2%80%93007\.pdf$/);
    expect(res.headers.get("x-papin-report")).toBe("draft");
    expect(res.headers.get("cache-control")).toBe("private, no-store");
  });
});
