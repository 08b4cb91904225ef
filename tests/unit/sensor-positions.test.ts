import { describe, expect, it } from "vitest";
import { guessSensorPosition, loadTypeLabel, needsSensorPositions, placementRefusal, SENSOR_POSITIONS, sensorPositionLabel } from "@/lib/domain";
import { channelPlacementsSchema, correctionFieldsSchema, createCycleFieldsSchema, mappingOverridesSchema } from "@/lib/validations/intake";

const IDS = { sterilizerId: "7d7f3c2e-4b1a-4f5e-9a3c-1b2d3e4f5a6b", profileId: "8e8f3c2e-4b1a-4f5e-9a3c-1b2d3e4f5a6b" };

describe("sensor positions (common practice: EN 285 small-load test probe placement, DOMAIN.md §2.3)", () => {
  it("has stable ids with a label each, the drain reference and free space among them", () => {
    expect(SENSOR_POSITIONS).toContain("reference-drain");
    expect(SENSOR_POSITIONS).toContain("free-space");
    expect(sensorPositionLabel("pack-centre")).toBe("Test pack, centre");
    // An id a later version adds still reads as words, never as a blank.
    expect(sensorPositionLabel("basket-corner")).toBe("Basket corner");
    expect(loadTypeLabel(null)).toBe("not recorded");
  });

  it("guesses from telling headers only", () => {
    expect(guessSensorPosition("Drain (°C)")).toBe("reference-drain");
    expect(guessSensorPosition("TC7 free space")).toBe("free-space");
    expect(guessSensorPosition("Pack centre")).toBe("pack-centre");
    expect(guessSensorPosition("CH3")).toBeNull();
  });

  it("air leakage and Bowie-Dick cycles need no positions; thermometric ones do", () => {
    expect(needsSensorPositions("air-leakage")).toBe(false);
    expect(needsSensorPositions("bowie-dick")).toBe(false);
    expect(needsSensorPositions("thermometric-small-load")).toBe(true);
    expect(needsSensorPositions("routine-load")).toBe(true);
  });

  it("names every unplaced channel, and a reference channel that is not at the drain", () => {
    const channels = ["Drain", "T1", "T2"];
    expect(placementRefusal({ temperatureChannels: channels, referenceChannel: "Drain", placements: { Drain: { position: "reference-drain" }, T1: { position: "pack-top" } } })).toMatch(
      /^The position of temperature channel "T2" is not recorded\. /,
    );
    expect(placementRefusal({ temperatureChannels: channels, referenceChannel: "Drain", placements: {} })).toMatch(/^The positions of temperature channels "Drain", "T1" and "T2" are not recorded\./);
    const wrongReference = placementRefusal({
      temperatureChannels: channels,
      referenceChannel: "Drain",
      placements: { Drain: { position: "door" }, T1: { position: "pack-top" }, T2: { position: "pack-bottom" } },
    });
    expect(wrongReference).toMatch(/^The reference channel "Drain" is not placed at the reference point \(chamber drain\)\./);
    expect(
      placementRefusal({
        temperatureChannels: channels,
        referenceChannel: "Drain",
        placements: { Drain: { position: "reference-drain" }, T1: { position: "pack-top" }, T2: { position: "other", note: "x" } },
      }),
    ).toBeNull();
  });
});

describe("the schemas", () => {
  it("a placement takes a listed position and a note of at most 200 characters; nothing else", () => {
    expect(channelPlacementsSchema.safeParse({ Drain: { position: "reference-drain", note: " in the drain " } }).data).toEqual({ Drain: { position: "reference-drain", note: "in the drain" } });
    expect(channelPlacementsSchema.safeParse({ Drain: { position: "reference-drain", note: "" } }).data).toEqual({ Drain: { position: "reference-drain" } });
    expect(channelPlacementsSchema.safeParse({ Drain: { position: "sink" } }).success).toBe(false);
    expect(channelPlacementsSchema.safeParse({ Drain: { position: "door", note: "x".repeat(201) } }).success).toBe(false);
    expect(channelPlacementsSchema.safeParse({ Drain: { position: "door", colour: "red" } }).success).toBe(false);
  });

  it("the mapping carries positions; the cycle fields carry the test pack or load and its lot", () => {
    expect(mappingOverridesSchema.parse({ positions: { T1: { position: "load-item" } } }).positions).toEqual({ T1: { position: "load-item" } });
    expect(createCycleFieldsSchema.parse({ ...IDS, loadType: "hollow-load-test", loadLot: " HL-22 " })).toMatchObject({ loadType: "hollow-load-test", loadLot: "HL-22" });
    expect(createCycleFieldsSchema.parse({ ...IDS, loadType: "", loadLot: "" })).toMatchObject({ loadType: undefined, loadLot: undefined });
    const bad = createCycleFieldsSchema.safeParse({ ...IDS, loadType: "towels" });
    expect(bad.error?.issues[0].message).toBe("Choose the test pack or load from the list.");
    expect(createCycleFieldsSchema.safeParse({ ...IDS, loadLot: "L".repeat(61) }).success).toBe(false);
    expect(correctionFieldsSchema.parse({ reason: "lot", loadLot: "STP-1" }).loadLot).toBe("STP-1");
  });
});
