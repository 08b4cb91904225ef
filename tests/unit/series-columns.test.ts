import { describe, expect, it } from "vitest";
import { recordingFromColumns, recordingToColumns } from "@/lib/cycles/series";
import type { Recording } from "@/lib/logger-files";

// Values worked by hand: three samples, two temperature channels (one reading missing), absolute pressure.
const recording: Recording = {
  startedAt: "2026-07-14T08:00:00",
  timesS: new Float64Array([0, 1.5, 3]),
  temperatures: [
    { header: "drain", values: new Float64Array([120.125, NaN, 134.000001]) },
    { header: "pack", values: new Float64Array([119, 121.1, 0.1 + 0.2]) },
  ],
  pressure: { header: "chamber", values: new Float64Array([198.5, 250, 304.4]) },
  referenceIndex: 0,
  freeSpaceIndex: 1,
};

describe("a recording as stored columns", () => {
  it("comes back sample for sample, headers and indexes included", () => {
    const columns = recordingToColumns(recording);
    // 3 samples × 8 bytes for the times; (2 temperatures + pressure) × 3 × 8 for the values.
    expect(columns.timesS.byteLength).toBe(24);
    expect(columns.channelValues.byteLength).toBe(72);
    // As the database hands a blob back: a Buffer at an offset that need not be a multiple of 8.
    const unaligned = (bytes: Uint8Array) => {
      const holder = Buffer.alloc(bytes.byteLength + 3);
      holder.set(bytes, 3);
      return holder.subarray(3);
    };
    const back = recordingFromColumns({
      ...JSON.parse(JSON.stringify({ meta: columns.meta, sampleCount: columns.sampleCount })),
      timesS: unaligned(columns.timesS),
      channelValues: unaligned(columns.channelValues),
    })!;
    expect(back.startedAt).toBe(recording.startedAt);
    expect(Array.from(back.timesS)).toEqual([0, 1.5, 3]);
    expect(back.temperatures.map((t) => t.header)).toEqual(["drain", "pack"]);
    expect(Array.from(back.temperatures[0].values)).toEqual([120.125, NaN, 134.000001]);
    expect(back.temperatures[1].values[2]).toBe(0.1 + 0.2);
    expect(Array.from(back.pressure.values)).toEqual([198.5, 250, 304.4]);
    expect(back.pressure.header).toBe("chamber");
    expect([back.referenceIndex, back.freeSpaceIndex]).toEqual([0, 1]);
  });

  it("is refused (read from the file instead) when the stored sizes do not add up", () => {
    const columns = recordingToColumns(recording);
    expect(recordingFromColumns({ ...columns, sampleCount: 4 })).toBeUndefined();
    expect(recordingFromColumns({ ...columns, channelValues: columns.channelValues.subarray(8) })).toBeUndefined();
  });
});
