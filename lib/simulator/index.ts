export { simulateCycle, simulateDay, seededRandom, SCENARIOS, type Scenario, type SimulateCycleOptions, type SimulateDayOptions, type SimulatedChannel, type SimulatedCycle } from "./cycle";
export { toLoggerCsv, type CsvDialect, type CsvTimeFormat } from "./csv";
export { simulateLeakTest, SIMULATED_CLOSE_S, type SimulateLeakTestOptions } from "./air-leakage";
export { drawIndicatorSheetPng, type DrawnSheet } from "./indicator-sheet";
export { simulatedPlacements } from "./positions";
