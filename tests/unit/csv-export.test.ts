import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import Papa from "papaparse";
import { csvRow, toCsv, type CsvCell } from "@/lib/csv-export";

const csvCell = (value: CsvCell) => csvRow([value]);

// The characters that make a spreadsheet evaluate a cell: OWASP "CSV Injection" page
// (= + - @, tab 0x09, carriage return 0x0D).
describe("CSV export is safe against spreadsheet formula injection", () => {
  it.each(['=HYPERLINK("http://x","y")', "+1+1", "-2+3", "@SUM(A1:A2)", "\tcmd", "\r=1", "+over\r\ntwo lines"])("a cell starting %j is prefixed with a single quote", (text) => {
    const cell = csvCell(text);
    expect(cell.startsWith(`"'`)).toBe(true);
    // Read back by an RFC 4180 parser, the value is the original text behind one quote.
    const [[parsed]] = Papa.parse<string[]>(cell, { newline: "\r\n" }).data;
    expect(parsed).toBe(`'${text}`);
  });

  it("leaves ordinary text, numbers and an empty cell alone", () => {
    expect(csvCell("BD-134 cycle 0042")).toBe("BD-134 cycle 0042");
    expect(csvCell("Sterilizer 2 (theatre)")).toBe("Sterilizer 2 (theatre)");
    expect(csvCell(134.5)).toBe("134.5");
    expect(csvCell(-3.2)).toBe("-3.2");
    expect(csvCell(null)).toBe("");
    expect(csvCell(undefined)).toBe("");
    expect(csvCell(Number.NaN)).toBe("");
    expect(csvCell(Number.POSITIVE_INFINITY)).toBe("");
    expect(csvCell(true)).toBe("true");
  });

  it("quotes delimiters, quotes and line breaks (RFC 4180)", () => {
    expect(csvCell("instruments, trays")).toBe('"instruments, trays"');
    expect(csvCell('a "wrapped" load')).toBe('"a ""wrapped"" load"');
    expect(csvCell("two\nlines")).toBe('"two\nlines"');
  });

  it("a full document round-trips through a CSV parser with every value intact", () => {
    const rows = [
      ["c1", "=cmd|' /C calc'!A0", 121.4, "pass"],
      ["c2", 'load "A", trays\r\nand wraps', -1, null],
      ["c3", "@attacker", 0, "fail"],
    ] as const;
    const text = toCsv(["id", "load", "value", "verdict"], rows);
    expect(text.charCodeAt(0)).toBe(0xfeff);
    const parsed = Papa.parse<string[]>(text.slice(1), { newline: "\r\n", skipEmptyLines: true }).data;
    expect(parsed).toEqual([
      ["id", "load", "value", "verdict"],
      ["c1", "'=cmd|' /C calc'!A0", "121.4", "pass"],
      ["c2", 'load "A", trays\r\nand wraps', "-1", ""],
      ["c3", "'@attacker", "0", "fail"],
    ]);
    // No cell of the file, as a spreadsheet reads it, starts with a formula character.
    for (const row of parsed.slice(1)) for (const cell of row) if (!/^-?\d/.test(cell)) expect(cell).not.toMatch(/^[=+\-@\t\r]/);
  });

  it("csvRow joins cells with commas", () => {
    expect(csvRow(["a", 1, null, "=x"])).toBe(`a,1,,"'=x"`);
  });
});

// The export route end to end on a temporary database: guard, filters, neutralised cells, audit.
describe("GET /api/cycles/export", () => {
  const session = { current: null as null | { user: { id: string } } };
  const ids: Record<string, string> = {};
  let ctx: Awaited<ReturnType<typeof import("../support/test-db").useTemporaryDatabase>>;
  let GET: (request: Request, context: unknown) => Promise<Response>;

  beforeAll(async () => {
    vi.doMock("next-auth", async () => ({ ...(await vi.importActual<typeof import("next-auth")>("next-auth")), getServerSession: async () => session.current }));
    const { useTemporaryDatabase } = await import("../support/test-db");
    ctx = await useTemporaryDatabase();
    const { users, sites, sterilizers, acceptanceProfiles, cycles } = await import("@/db/schema");
    const { hashPassword } = await import("@/lib/auth/password");
    const [site] = await ctx.db.insert(sites).values({ name: "Export site", code: "EXP" }).returning();
    const [other] = await ctx.db.insert(sites).values({ name: "Another site", code: "OTH" }).returning();
    const passwordHash = await hashPassword("a test password");
    for (const role of ["technician", "auditor", "admin"] as const) {
      const [u] = await ctx.db
        .insert(users)
        .values({ email: `${role}@export.example`, name: `The ${role}`, role, passwordHash, siteId: site.id })
        .returning();
      ids[role] = u.id;
    }
    const [outsider] = await ctx.db.insert(users).values({ email: "else@export.example", name: "Elsewhere", role: "technician", passwordHash, siteId: other.id }).returning();
    const [profile] = await ctx.db.insert(acceptanceProfiles).values({ siteId: site.id, name: "134 °C / 3 min", sterilizationTempC: 134, holdingTimeS: 180, basis: "en-285" }).returning();
    const [otherProfile] = await ctx.db.insert(acceptanceProfiles).values({ siteId: other.id, name: "121 °C / 15 min", sterilizationTempC: 121, holdingTimeS: 900, basis: "en-285" }).returning();
    const [sterilizer] = await ctx.db.insert(sterilizers).values({ siteId: site.id, name: "Porous load 1", serialNumber: "PL-1", chamberVolumeL: 445 }).returning();
    const [otherSterilizer] = await ctx.db.insert(sterilizers).values({ siteId: other.id, name: "Far away", serialNumber: "FA-1", chamberVolumeL: 60 }).returning();
    const base = { siteId: site.id, sterilizerId: sterilizer.id, profileId: profile.id, createdBy: ids.technician };
    await ctx.db.insert(cycles).values([
      { ...base, cycleNumber: "C-0001", verdict: "pass", status: "approved", startedAt: "2025-03-03T07:30:00.000Z", loadDescription: "Test pack, 6 probes" },
      { ...base, cycleNumber: '=HYPERLINK("http://evil.example","open")', verdict: "fail", status: "draft", startedAt: "2025-03-04T07:30:00.000Z", loadDescription: "@SUM(1+1), trays" },
      { ...base, cycleNumber: "C-0003", verdict: "fail", status: "submitted", startedAt: "2025-03-05T07:30:00.000Z", loadDescription: "+wrapped\r\ninstruments" },
      { siteId: other.id, sterilizerId: otherSterilizer.id, profileId: otherProfile.id, createdBy: outsider.id, cycleNumber: "OTHER-SITE", verdict: "pass", startedAt: "2025-03-04T08:00:00.000Z" },
    ]);
    ({ GET } = await import("@/app/api/cycles/export/route"));
  });
  afterAll(() => ctx?.cleanup());

  async function exportAs(key: string | null, query = "") {
    session.current = key ? { user: { id: ids[key] } } : null;
    const response = await GET(new Request(`http://papin.test/api/cycles/export${query}`), {});
    const text = await response.text();
    return { response, text, rows: response.ok ? Papa.parse<string[]>(text.replace(/^\uFEFF/, ""), { newline: "\r\n", skipEmptyLines: true }).data : [] };
  }

  it("refuses an anonymous request (401) and an administrator (403: cycles are not theirs to read)", async () => {
    expect((await exportAs(null)).response.status).toBe(401);
    const admin = await exportAs("admin");
    expect(admin.response.status).toBe(403);
    expect(JSON.parse(admin.text).error).toMatch(/export cycles/);
  });

  it("gives the site's cycles as a CSV download with every formula neutralised", async () => {
    const { response, rows } = await exportAs("auditor", "?sort=cycleNumber:asc");
    expect(response.status).toBe(200);
    expect(response.headers.get("content-type")).toBe("text/csv; charset=utf-8");
    expect(response.headers.get("content-disposition")).toMatch(/^attachment; filename=papin-cycles-\d{4}-\d{2}-\d{2}\.csv$/);
    expect(rows[0][0]).toBe("Cycle number");
    const body = rows.slice(1);
    expect(body.map((r) => r[0])).toEqual(['\'=HYPERLINK("http://evil.example","open")', "C-0001", "C-0003"]);
    expect(body.find((r) => r[0] === "C-0003")![6]).toBe("'+wrapped\r\ninstruments");
    expect(body.find((r) => r[0].startsWith("'="))![6]).toBe("'@SUM(1+1), trays");
    for (const r of body) for (const cell of r) expect(cell).not.toMatch(/^[=+\-@\t\r]/);
    expect(body.some((r) => r[0] === "OTHER-SITE")).toBe(false);
  });

  it("applies the list's filters", async () => {
    const failed = await exportAs("technician", "?verdict=fail&sort=startedAt:asc");
    expect(failed.rows.slice(1).map((r) => r[8])).toEqual(["fail", "fail"]);
    const submitted = await exportAs("technician", "?status=submitted");
    expect(submitted.rows.slice(1).map((r) => r[0])).toEqual(["C-0003"]);
    const dated = await exportAs("technician", "?from=2025-03-04&to=2025-03-04");
    expect(dated.rows.length).toBe(2);
    const bad = await exportAs("technician", "?verdict=maybe");
    expect(bad.response.status).toBe(400);
    expect(JSON.parse(bad.text).error).toMatch(/verdict must be pass or fail/);
  });

  it("writes the export to the audit ledger with its filters and row count", async () => {
    await exportAs("auditor", "?status=approved");
    const { listAuditEvents } = await import("@/lib/services/audit");
    const { getUserById } = await import("@/db/queries/users");
    const auditor = (await getUserById({ id: ids.auditor }))!;
    const { items } = await listAuditEvents({ actor: auditor, filter: { action: "cycles.export" } });
    const latest = items[0];
    expect(latest.actorEmail).toBe("auditor@export.example");
    expect(JSON.parse(String(latest.newValue))).toMatchObject({ filter: { status: "approved" }, rows: 1 });
  });
});
