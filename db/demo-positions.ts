/**
 * The demo cycles' probe positions and test pack, as a technician records them at intake: the drain probe at the
 * reference point, the pack probes down the standard test pack (lib/simulator/positions.ts), and the pack's lot.
 */
import { inspectLoggerFile, type MappingOverrides } from "@/lib/logger-files";
import { simulatedPlacements } from "@/lib/simulator";
import type { LoadType } from "@/lib/domain";

/** The mapping a demo file is analysed with: the guess, plus where each temperature channel's probe sat. */
export function demoMapping(bytes: Uint8Array): MappingOverrides {
  const temperatures = inspectLoggerFile(bytes)
    .columns.filter((c) => c.role === "temperature")
    .map((c) => c.header);
  return { positions: simulatedPlacements(temperatures) };
}

/** A standard test pack from one of two lots, by the cycle's ordinal (fictional lot numbers). */
export function demoLoad(ordinal: number): { loadType: LoadType; loadLot: string } {
  return { loadType: "standard-test-pack", loadLot: ordinal % 2 === 0 ? "STP-2611-04" : "STP-2611-09" };
}
