// Papin's notification texts. The expected strings are Papin's own wording (constructed
// definition tests); the escaping rules are those of the HTML standard for text and attribute
// values (& < > " ').
import { describe, expect, it } from "vitest";
import { SAFETY_SHORT } from "@/lib/safety";
import { analysisFailedMail, cycleApprovedMail, cycleFailureConfirmedMail, cycleRejectedMail, cycleSubmittedMail, cycleUrl, escapeHtml, sterilizerStatusMail } from "@/lib/mail/templates";

const base = { cycleNumber: "P1-20260310-001", sterilizerName: "Porous load 1", url: "https://papin.marlow-bridge.example/cycles/cy-1" };
const all = [
  cycleSubmittedMail({ ...base, submitterName: "Tomás Brooks" }),
  cycleRejectedMail({ ...base, reason: "Drain probe misplaced", signerName: "Adaeze Okafor" }),
  cycleApprovedMail({ ...base, signerName: "Priya Nair", reportNumber: "MBGH-2026-0042" }),
  analysisFailedMail({ ...base, summary: "Air in the chamber.", failedChecks: ["Saturation"] }),
  cycleFailureConfirmedMail({ ...base, signerName: "Priya Nair", reportNumber: "MBGH-2026-0043", reason: null }),
];

describe("every notification", () => {
  it.each(all.map((m) => [m.subject, m]))("%s: links to the record and carries the safety reminder in HTML and text", (_subject, m) => {
    expect(m.text).toContain(base.url);
    expect(m.html).toContain(`href="${base.url}"`);
    expect(m.text).toContain(SAFETY_SHORT);
    expect(m.html).toContain(escapeHtml(SAFETY_SHORT));
    expect(m.subject).not.toMatch(/[\r\n]/);
    expect(m.html.startsWith("<!doctype html>")).toBe(true);
  });
});

describe("escaping", () => {
  const hostile = "<script>alert(\"x\")</script> & 'co'";
  const m = cycleRejectedMail({ cycleNumber: "7<b>", sterilizerName: hostile, url: 'https://p.example/cycles/a"onmouseover="x', reason: hostile, signerName: "<img src=x onerror=alert(1)>" });

  it("turns markup in names and reasons into text in the HTML body", () => {
    expect(m.html).not.toContain("<script>");
    expect(m.html).not.toContain("<img");
    expect(m.html).not.toContain("<b>");
    expect(m.html).toContain("&lt;script&gt;alert(&quot;x&quot;)&lt;/script&gt; &amp; &#39;co&#39;");
  });

  it("cannot break out of the link's attribute", () => {
    expect(m.html).toContain('href="https://p.example/cycles/a&quot;onmouseover=&quot;x"');
    expect(m.html).not.toContain('"onmouseover="');
  });

  it("leaves the plain-text body as written", () => {
    expect(m.text).toContain(hostile);
  });

  it("keeps a subject on one line even when a name holds a line break", () => {
    const s = cycleSubmittedMail({ ...base, sterilizerName: "Porous\r\nBcc: someone@evil.example", submitterName: "x" });
    expect(s.subject).toBe("Cycle P1-20260310-001 on Porous Bcc: someone@evil.example is ready for review");
  });

  it("escapes the five characters the HTML standard reserves", () => {
    expect(escapeHtml(`&<>"'`)).toBe("&amp;&lt;&gt;&quot;&#39;");
  });
});

describe("what each says", () => {
  it("rejected: quotes the reason line by line in the text body", () => {
    const m = cycleRejectedMail({ ...base, reason: "Holding time short.\nRepeat after the door seal is replaced.", signerName: "Adaeze Okafor" });
    expect(m.text).toContain("Reason given\n> Holding time short.\n> Repeat after the door seal is replaced.");
    expect(m.html).toContain("Adaeze Okafor returned cycle P1-20260310-001 on Porous load 1");
  });

  it("approved: names the signer and the report number", () => {
    const m = cycleApprovedMail({ ...base, signerName: "Priya Nair", reportNumber: "MBGH-2026-0042" });
    expect(m.text).toContain("Priya Nair approved cycle P1-20260310-001");
    expect(m.text).toContain("The signed report MBGH-2026-0042 is in the archive.");
  });

  it("failure confirmed: names the signer, the report marked FAIL and the engineer's note when there is one", () => {
    const m = cycleFailureConfirmedMail({ ...base, signerName: "Priya Nair", reportNumber: "MBGH-2026-0043", reason: "Door seal to be replaced." });
    expect(m.subject).toBe("Cycle P1-20260310-001 on Porous load 1: failure confirmed");
    expect(m.text).toContain("Priya Nair confirmed with an electronic signature that cycle P1-20260310-001 on Porous load 1 failed its test.");
    expect(m.text).toContain("The signed report MBGH-2026-0043, marked FAIL, is in the archive");
    expect(m.text).toContain("Note from the engineer\n> Door seal to be replaced.");
    expect(cycleFailureConfirmedMail({ ...base, signerName: "P", reportNumber: "R", reason: null }).text).not.toContain("Note from the engineer");
  });

  it("analysis failed: lists each check not met, and leaves the list out when there is none", () => {
    const m = analysisFailedMail({ ...base, summary: "Air in the chamber.", failedChecks: ["Saturation: below by 2.4 K", "Holding time: 162 s of 180 s"] });
    expect(m.text).toContain("Checks not met\n- Saturation: below by 2.4 K\n- Holding time: 162 s of 180 s");
    expect(m.html).toContain("<li>Holding time: 162 s of 180 s</li>");
    expect(analysisFailedMail({ ...base, summary: "No plateau reached.", failedChecks: [] }).text).not.toContain("Checks not met");
  });

  it("submitted: says who submitted", () => {
    expect(cycleSubmittedMail({ ...base, submitterName: "Tomás Brooks" }).text).toContain("Tomás Brooks submitted cycle P1-20260310-001 on Porous load 1 for review.");
  });
});

describe("links", () => {
  it("come from NEXTAUTH_URL without a doubled slash, else this machine's development port", () => {
    const saved = { url: process.env.NEXTAUTH_URL, port: process.env.PORT };
    try {
      process.env.NEXTAUTH_URL = "https://papin.example/";
      expect(cycleUrl("a b")).toBe("https://papin.example/cycles/a%20b");
      delete process.env.NEXTAUTH_URL;
      delete process.env.PORT;
      expect(cycleUrl("c1")).toBe("http://localhost:3000/cycles/c1");
      process.env.PORT = "3205";
      expect(cycleUrl("c1")).toBe("http://localhost:3205/cycles/c1");
    } finally {
      for (const [name, value] of [
        ["NEXTAUTH_URL", saved.url],
        ["PORT", saved.port],
      ] as const) {
        if (value === undefined) delete process.env[name];
        else process.env[name] = value;
      }
    }
  });
});

describe("sterilizer status mail", () => {
  const url = "https://papin.marlow-bridge.example/sterilizers/st-1";
  it("says out of use, since when, the reason and that a test cycle may re-qualify it; escapes the name", () => {
    const m = sterilizerStatusMail({
      sterilizerName: "Porous <load>\n1",
      status: "out-of-use",
      reason: "Bowie-Dick test of 2026-03-10 failed (confirmed).",
      since: "10 Mar 2026, 07:00",
      byName: null,
      url,
    });
    expect(m.subject).toBe("Porous <load> 1 is out of use");
    expect(m.html).toContain("Porous &lt;load&gt;");
    expect(m.text).toContain("is out of use since 10 Mar 2026, 07:00.");
    expect(m.text).toContain("> Bowie-Dick test of 2026-03-10 failed (confirmed).");
    expect(m.text).toContain("A test cycle may still be recorded to re-qualify it");
    expect(m.text).toContain(url);
    expect(m.text).toContain(SAFETY_SHORT);
  });

  it("names the engineer of a signed release", () => {
    const m = sterilizerStatusMail({ sterilizerName: "Fluids", status: "in-use", reason: "Released by Priya Nair: seal replaced.", since: "11 Mar 2026, 09:00", byName: "Priya Nair", url });
    expect(m.subject).toBe("Fluids is back in use");
    expect(m.text).toContain("Fluids is in use since 11 Mar 2026, 09:00, by the signed decision of Priya Nair.");
  });
});
