/**
 * quietframe for Node: everything of the browser-safe main entry, plus what needs the
 * platform — tolerance maps and Monte Carlo spreads on worker threads, reading set-up files, and
 * sweeps (maps, spreads and optimizer starts in chunks for a cluster's scheduler).
 */
export * from "./index";
export { toleranceMap, TolerancePool } from "./tolerance/node";
export { loadSetupFile } from "./setup/load-file";
export { spreadAnalysisOnThreads, type SpreadThreadOptions } from "./design/spread-threads";
export * from "./sweep";
