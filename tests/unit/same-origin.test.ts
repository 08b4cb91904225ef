import { afterEach, describe, expect, it } from "vitest";
import { parse } from "content-disposition";
import { safeCallbackPath, sameOriginRedirect } from "@/lib/auth/callback-url";
import { FOREIGN_ORIGIN_REFUSAL, foreignOriginRefusal } from "@/lib/request-origin";
import { downloadDisposition } from "@/lib/http";
import { productionStartRefusal, publicBaseUrl, secureCookies } from "@/lib/env";

const saved = { url: process.env.NEXTAUTH_URL, secret: process.env.NEXTAUTH_SECRET, port: process.env.PORT };
afterEach(() => {
  for (const [name, value] of [
    ["NEXTAUTH_URL", saved.url],
    ["NEXTAUTH_SECRET", saved.secret],
    ["PORT", saved.port],
  ] as const) {
    if (value === undefined) delete process.env[name];
    else process.env[name] = value;
  }
});

describe("the sign-in callback", () => {
  it("keeps a path on this site, query and all", () => {
    for (const path of ["/", "/cycles/5b0e?tab=chart", "/review?status=submitted&page=2", "/cycles?q=a%20b", "/archive#2026"]) expect(safeCallbackPath(path)).toBe(path);
  });

  // Each of these leaves the site in a browser, or could after one more decoding (the report: /%5Cevil.example/).
  it.each([
    ["/\\evil.example/", "the backslash form, as the framework hands over /%5Cevil.example/ decoded"],
    ["/%5Cevil.example/", "the backslash still encoded"],
    ["/%255Cevil.example/", "the backslash encoded twice"],
    ["//evil.example/", "a protocol-relative URL"],
    ["/%2F/evil.example/", "a protocol-relative URL once decoded"],
    ["https://evil.example/", "an absolute URL"],
    ["javascript:alert(1)", "a script URL"],
    ["/\tevil.example", "a control character, which URL parsers drop"],
    ["evil.example", "no leading slash"],
    ["/%E0%A4%A", "a broken percent-encoding"],
    ["", "nothing"],
  ])("sends %s to the overview (%s)", (value) => {
    expect(safeCallbackPath(value)).toBe("/");
  });

  it("is what next-auth's redirect callback allows: this origin's paths only", () => {
    const baseUrl = "https://papin.example.org";
    expect(sameOriginRedirect({ url: "/cycles/1?x=2", baseUrl })).toBe("https://papin.example.org/cycles/1?x=2");
    expect(sameOriginRedirect({ url: "https://papin.example.org/archive", baseUrl })).toBe("https://papin.example.org/archive");
    expect(sameOriginRedirect({ url: "/\\evil.example/", baseUrl })).toBe("https://papin.example.org/");
    expect(sameOriginRedirect({ url: "https://evil.example/cycles", baseUrl })).toBe("https://papin.example.org/");
    expect(sameOriginRedirect({ url: "http://papin.example.org/cycles", baseUrl })).toBe("https://papin.example.org/");
    expect(sameOriginRedirect({ url: "https://papin.example.org//evil.example/", baseUrl })).toBe("https://papin.example.org/");
  });
});

describe("the Origin check on requests that change something", () => {
  const post = (headers: Record<string, string>, url = "http://papin.test/api/cycles") => new Request(url, { method: "POST", headers });

  it("lets reads through from anywhere (they change nothing, and CORS keeps their answers from other sites)", () => {
    expect(foreignOriginRefusal(new Request("http://papin.test/api/cycles", { headers: { origin: "https://evil.example" } }))).toBeNull();
  });

  it("without a configured public URL, accepts this server's own host and refuses every other origin", () => {
    delete process.env.NEXTAUTH_URL;
    expect(foreignOriginRefusal(post({ origin: "http://papin.test" }))).toBeNull();
    expect(foreignOriginRefusal(post({ origin: "http://localhost:3000", host: "localhost:3000" }))).toBeNull();
    expect(foreignOriginRefusal(post({ origin: "https://evil.example" }))).toBe(FOREIGN_ORIGIN_REFUSAL);
    expect(foreignOriginRefusal(post({ origin: "http://papin.test.evil.example" }))).toBe(FOREIGN_ORIGIN_REFUSAL);
    expect(foreignOriginRefusal(post({ origin: "null" }))).toBe(FOREIGN_ORIGIN_REFUSAL);
  });

  it("with NEXTAUTH_URL, accepts its origin only, whatever host the request names", () => {
    process.env.NEXTAUTH_URL = "https://papin.example.org/";
    expect(foreignOriginRefusal(post({ origin: "https://papin.example.org" }))).toBeNull();
    expect(foreignOriginRefusal(post({ origin: "http://papin.example.org" }))).toBe(FOREIGN_ORIGIN_REFUSAL);
    expect(foreignOriginRefusal(post({ origin: "http://papin.test" }))).toBe(FOREIGN_ORIGIN_REFUSAL);
  });

  it("without Origin, refuses what the browser marks as sent from another site and lets scripts through", () => {
    expect(foreignOriginRefusal(post({ "sec-fetch-site": "cross-site" }))).toBe(FOREIGN_ORIGIN_REFUSAL);
    expect(foreignOriginRefusal(post({ "sec-fetch-site": "same-site" }))).toBe(FOREIGN_ORIGIN_REFUSAL);
    expect(foreignOriginRefusal(post({ "sec-fetch-site": "same-origin" }))).toBeNull();
    expect(foreignOriginRefusal(post({}))).toBeNull();
  });
});

describe("download names (RFC 6266 with an RFC 5987 filename*)", () => {
  it.each([["DRAFT-P1–20260310–001.pdf"], ["MBGH-2026-0042 №7.pdf"], ["papin-cycles-2026-03-10.csv"]])("%s: a header value Node accepts, naming the file exactly", (name) => {
    const value = downloadDisposition(name);
    expect(() => new Response("x", { headers: { "Content-Disposition": value } })).not.toThrow();
    const { type, parameters } = parse(value);
    expect(type).toBe("attachment");
    expect(parameters.filename).toBe(name);
  });

  it("keeps a quote inside the name: no second filename= parameter", () => {
    const name = 'C-1"; filename="evil.exe.pdf';
    const value = downloadDisposition(name, "inline");
    expect(parse(value)).toEqual({ type: "inline", parameters: { filename: name } });
    expect(value).toBe(`inline; filename="C-1\\"; filename=\\"evil.exe.pdf"`);
  });

  it("gives a cycle number with a dash or a numero sign an ASCII fallback and the exact name beside it", () => {
    expect(downloadDisposition("T–1 №5.pdf")).toBe(`attachment; filename="T?1 ?5.pdf"; filename*=UTF-8''T%E2%80%931%20%E2%84%965.pdf`);
  });
});

describe("production settings", () => {
  it("mail links use NEXTAUTH_URL, else this machine's port in development", () => {
    process.env.NEXTAUTH_URL = "https://papin.example.org/";
    expect(publicBaseUrl()).toBe("https://papin.example.org");
    delete process.env.NEXTAUTH_URL;
    process.env.PORT = "3207";
    expect(publicBaseUrl()).toBe("http://localhost:3207");
  });

  it("cookies are Secure exactly when the public URL is https", () => {
    process.env.NEXTAUTH_URL = "https://papin.example.org";
    expect(secureCookies()).toBe(true);
    process.env.NEXTAUTH_URL = "http://127.0.0.1:3111";
    expect(secureCookies()).toBe(false);
    delete process.env.NEXTAUTH_URL;
    expect(secureCookies()).toBe(false);
  });

  it("npm start names each missing setting in one line", () => {
    delete process.env.NEXTAUTH_URL;
    delete process.env.NEXTAUTH_SECRET;
    expect(productionStartRefusal()).toBe(
      "Papin will not start: set NEXTAUTH_SECRET (a random secret of at least 16 characters) and NEXTAUTH_URL (the portal's public URL, such as https://papin.example.org) in the environment; see README, Configuration.",
    );
    process.env.NEXTAUTH_SECRET = "a-secret-of-32-characters-000000";
    expect(productionStartRefusal()).toMatch(/^Papin will not start: set NEXTAUTH_URL \(/);
    process.env.NEXTAUTH_URL = "https://papin.example.org";
    expect(productionStartRefusal()).toBeNull();
  });
});
