import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { useTemporaryDatabase } from "../support/test-db";

const session = vi.hoisted(() => ({ current: null as null | { user: { id: string } } }));
vi.mock("next-auth", async (original) => ({
  ...(await original<typeof import("next-auth")>()),
  getServerSession: async () => session.current,
}));

let ctx: Awaited<ReturnType<typeof useTemporaryDatabase>>;
const ids: Record<string, string> = {};
let GET: (request: Request, context: unknown) => Promise<Response>;

beforeAll(async () => {
  ctx = await useTemporaryDatabase();
  const { users, sites } = await import("@/db/schema");
  const { hashPassword } = await import("@/lib/auth/password");
  const [seaLevel] = await ctx.db.insert(sites).values({ name: "Sea-level site", code: "SEA" }).returning();
  const [barometer] = await ctx.db.insert(sites).values({ name: "Site with a barometer", code: "BARO", atmosphereKpa: 98.2 }).returning();
  const [hill] = await ctx.db.insert(sites).values({ name: "Hill site", code: "HILL", altitudeM: 1500 }).returning();
  const passwordHash = await hashPassword("a test password");
  const people = [
    ["technician", seaLevel.id],
    ["auditor", seaLevel.id],
    ["admin", seaLevel.id],
    ["engineer", barometer.id],
    ["hill", hill.id],
  ] as const;
  for (const [key, siteId] of people) {
    const role = key === "hill" ? "technician" : key;
    const [u] = await ctx.db
      .insert(users)
      .values({ email: `${key}@test.example`, name: key, role, passwordHash, siteId })
      .returning();
    ids[key] = u.id;
  }
  ({ GET } = await import("@/app/api/steam/saturation/route"));
});
afterAll(() => ctx.cleanup());

async function ask(query: string, as: string | null = "technician") {
  session.current = as ? { user: { id: ids[as] } } : null;
  const response = await GET(new Request(`http://papin.test/api/steam/saturation?${query}`), {});
  return { status: response.status, body: await response.json() };
}

describe("GET /api/steam/saturation: temperature → pressure", () => {
  // Check values: DOMAIN.md §1.4, IF97 region 4 computed with an independent implementation;
  // 121 °C and 134 °C also in ASHRAE Handbook—Fundamentals 2021 ch. 1 Table 3 (134 °C: 304.1989 kPa).
  it.each([
    [121, 205.04, 103.71, 2.0504, 15.04],
    [124, 225.17, 123.84, 2.2517, 17.96],
    [126, 239.46, 138.14, 2.3946, 20.04],
    [129, 262.27, 160.95, 2.6227, 23.34],
    [134, 304.2, 202.87, 3.042, 29.42],
    [137, 331.85, 230.53, 3.3185, 33.44],
  ])("%s °C is %s kPa abs, %s kPa gauge, %s bar abs, %s psig (DOMAIN §1.4, IF97 computed)", async (t, kpaAbs, kpaGauge, barAbs, psig) => {
    const { status, body } = await ask(`temperature=${t}&unit=C`);
    expect(status).toBe(200);
    expect(body.pressureKpaAbs).toBeCloseTo(kpaAbs, 1);
    expect(body.pressureKpaGauge).toBeCloseTo(kpaGauge, 1);
    expect(body.pressureBarAbs).toBeCloseTo(barAbs, 3);
    expect(body.pressurePsig).toBeCloseTo(psig, 1);
    expect(body.atmosphereKpa).toBe(101.325);
    expect(body.atmosphereSource).toBe("standard");
  });

  it("134 °C gives 304.1989 kPa abs (ASHRAE Handbook—Fundamentals 2021 ch. 1 Table 3)", async () => {
    const { body } = await ask("temperature=134");
    expect(body.pressureKpaAbs).toBeCloseTo(304.1989, 3);
  });

  it("500 K gives 2.63889776 MPa (IF97-Rev Table 35)", async () => {
    const { body } = await ask("temperature=500&unit=K");
    expect(body.pressures.MPa.absolute).toBeCloseTo(2.63889776, 7);
    expect(body.temperatureC).toBeCloseTo(226.85, 9);
  });

  it("273.2 °F (134 °C exactly) is read as Fahrenheit (IF97 computed, DOMAIN §1.4)", async () => {
    const { body } = await ask("temperature=273.2&unit=F");
    expect(body.temperatureC).toBeCloseTo(134, 9);
    expect(body.pressureKpaAbs).toBeCloseTo(304.2, 1);
  });
});

describe("GET /api/steam/saturation: pressure → temperature", () => {
  it("0.1 MPa abs boils at 372.755919 K (IF97-Rev Table 36)", async () => {
    const { status, body } = await ask("pressure=0.1&unit=MPa");
    expect(status).toBe(200);
    expect(body.temperatureK).toBeCloseTo(372.755919, 5);
  });

  it("101.325 kPa boils at 99.974 °C, 200 kPa at 120.21 °C, 300 kPa at 133.53 °C (DOMAIN §1.4, IF97 computed)", async () => {
    expect((await ask("pressure=101.325&unit=kPa")).body.temperatureC).toBeCloseTo(99.974, 3);
    expect((await ask("pressure=2&unit=bar&gauge=false")).body.temperatureC).toBeCloseTo(120.21, 2);
    expect((await ask("pressure=3000&unit=mbar")).body.temperatureC).toBeCloseTo(133.53, 2);
  });

  it("202.87 kPa gauge at the standard atmosphere is 134 °C (DOMAIN §1.4, IF97 computed)", async () => {
    const { body } = await ask("pressure=202.87&unit=kPa&gauge=true");
    expect(body.pressureKpaAbs).toBeCloseTo(304.195, 3);
    expect(body.temperatureC).toBeCloseTo(134, 2);
    expect(body.input).toMatchObject({ quantity: "pressure", unit: "kPa", gauge: true });
  });

  it("29.42 psig, written as unit=psig, is 134 °C (DOMAIN §1.4, IF97 computed)", async () => {
    const { body } = await ask("pressure=29.42&unit=psig");
    expect(body.input.gauge).toBe(true);
    expect(body.temperatureC).toBeCloseTo(134, 1);
  });

  it("uses the atmosphere given: 200 kPa gauge at 98.2 kPa is 298.2 kPa abs", async () => {
    const { body } = await ask("pressure=200&unit=kPa&gauge=true&atmosphere=98.2");
    expect(body.pressureKpaAbs).toBeCloseTo(298.2, 9);
    expect(body.atmosphereSource).toBe("request");
  });

  it("at 1500 m the standard atmosphere is 84.56 kPa (ASHRAE Handbook—Fundamentals 2021 ch. 1 Table 1: 84.556 kPa)", async () => {
    const { body } = await ask("pressure=0&unit=kPa&gauge=true&altitude=1500");
    expect(body.atmosphereKpa).toBeCloseTo(84.556, 1);
    expect(body.atmosphereSource).toBe("altitude");
    // Water boils near 95 °C at 1500 m (common practice; IF97 at 84.56 kPa gives 94.9 °C).
    expect(body.temperatureC).toBeCloseTo(94.9, 0);
  });

  it("takes the site's barometric pressure when none is given", async () => {
    const { body } = await ask("pressure=100&unit=kPa&gauge=true", "engineer");
    expect(body.atmosphereKpa).toBe(98.2);
    expect(body.atmosphereSource).toBe("site");
    expect(body.pressureKpaAbs).toBeCloseTo(198.2, 9);
  });

  it("derives the atmosphere from the site's altitude when the site has no barometric pressure", async () => {
    const { body } = await ask("temperature=121", "hill");
    expect(body.atmosphereSource).toBe("site-altitude");
    expect(body.atmosphereKpa).toBeCloseTo(84.556, 1);
    expect(body.pressureKpaGauge).toBeCloseTo(205.04 - 84.556, 1);
  });
});

describe("GET /api/steam/saturation: who may ask, and bad input", () => {
  it("refuses an anonymous request with 401", async () => {
    const { status, body } = await ask("temperature=121", null);
    expect(status).toBe(401);
    expect(body.error).toMatch(/sign in/i);
  });

  it.each(["technician", "engineer", "auditor", "admin"])("answers the %s", async (role) => {
    expect((await ask("temperature=121", role)).status).toBe(200);
  });

  it.each([
    ["temperature=abc", /^The temperature "abc" is not a number; write it in figures with a decimal point, for example 134\.$/],
    ["temperature=", /^Enter the temperature, for example 134\.$/],
    ["temperature=121&unit=X", /"X" is not a temperature unit/],
    ["pressure=2&unit=furlongs", /"furlongs" is not a pressure unit/],
    ["pressure=2&unit=bar&gauge=maybe", /^Say whether the pressure is gauge \(above the atmosphere\) or absolute; "maybe" is neither\.$/],
    ["", /^Give a temperature \(for example 134 °C\) or a pressure \(for example 304\.2 kPa\)\.$/],
    ["temperature=121&pressure=200", /not both/],
    ["pressure=2&unit=bar&gauge=true&atmosphere=5000", /not plausible/],
    ["pressure=2&unit=bar&atmosphere=100&altitude=10", /not both/],
    ["pressure=2&unit=barg&gauge=false", /says gauge but the pressure was marked absolute/],
  ])("?%s → 400 with a plain message", async (query, message) => {
    const { status, body } = await ask(query);
    expect(status).toBe(400);
    expect(body.error).toMatch(message);
    expect(JSON.stringify(body)).not.toMatch(/at .*\.ts:\d+/);
  });

  it("beyond the critical point (400 °C) → 422 saying so", async () => {
    const { status, body } = await ask("temperature=400&unit=C");
    expect(status).toBe(422);
    expect(body.error).toMatch(/above the critical point \(373\.946 °C\)/);
  });

  it("below the triple point (−5 °C) → 422 saying so", async () => {
    const { status, body } = await ask("temperature=-5&unit=C");
    expect(status).toBe(422);
    expect(body.error).toMatch(/below the triple point/);
  });

  it("a pressure above 22.064 MPa → 422, and a negative absolute pressure → 422", async () => {
    const above = await ask("pressure=25&unit=MPa");
    expect(above.status).toBe(422);
    expect(above.body.error).toMatch(/critical/);
    const negative = await ask("pressure=-150&unit=kPa&gauge=true");
    expect(negative.status).toBe(422);
    expect(negative.body.error).toMatch(/cannot be negative/);
  });
});
