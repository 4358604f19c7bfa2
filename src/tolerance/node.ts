/** Tolerance maps on worker threads (Node only): the pool and the map that uses it when it can. */
export { toleranceMap } from "./map";
export { TolerancePool } from "./parallel";
