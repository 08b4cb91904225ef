export * from "./limits";
export * from "./air-leakage";
export * from "./steam-quality";
export * from "./bowie-dick";
export * from "./schedule";
export * from "./calibration";
export * from "./sterilizer-class";
export * from "./trends";
