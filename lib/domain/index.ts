/**
 * Papin's vocabulary: the enums every layer shares, their words, and one formatter per quantity.
 * Imports nothing outside this folder, so the database schema, the server and the browser can
 * all take it without pulling each other in.
 */
export * from "./roles";
export * from "./cycles";
export * from "./test-kinds";
export * from "./equipment";
export * from "./units";
export * from "./format";
export * from "./profile-basis";
export * from "./time-zone";
export * from "./sterilizer-status";
export * from "./api-tokens";
export * from "./air-leakage";
export * from "./words";
export * from "./sensor-positions";
export * from "./studies";
