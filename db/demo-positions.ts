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

/** The test pack or load of a demo cycle: a standard test pack from one of two lots, a wrapped instrument tray on the benchtop, or a media-bottle batch on the fluids sterilizer (fictional numbers). */
export function demoLoad(ordinal: number, kind: "porous" | "fluids" | "benchtop" = "porous"): { loadType: LoadType; loadLot: string } {
  if (kind === "fluids") return { loadType: "fluids-load", loadLot: `MB-2611-${String(10 + (ordinal % 7)).padStart(2, "0")}` };
  if (kind === "benchtop") return { loadType: "wrapped-instruments", loadLot: `TRAY-${String(100 + (ordinal % 5))}` };
  return { loadType: "standard-test-pack", loadLot: ordinal % 2 === 0 ? "STP-2611-04" : "STP-2611-09" };
}
