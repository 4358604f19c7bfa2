/**
 * Design answers: which parameter is the bottleneck (rankParameters), the value a parameter must
 * reach for a target and the window that keeps it (solveForTarget, targetWindow), the best
 * settings within bounds (optimizeDesign), what real-world spread does (spreadAnalysis) and
 * headline figures that do not depend on the grid (refinedHeadline). Long runs can be stopped
 * (options.signal) and run in slices (rankSteps, optimizeSteps, spreadSteps with runInSlices). Platform-free.
 */
export { rankParameters, type RankOptions, type Ranking, type ParameterSensitivity } from "./rank";
export { rankSteps, type RankStepOptions } from "./rank-steps";
export { solveForTarget, targetWindow, type SolveOptions, type SolveResult, type WindowResult, type WindowEnd, type SettingFigure } from "./solve";
export { optimizeDesign, optimizeSteps, type ProvisionalOptimum, type OptimizeParameter, type OptimizeOptions, type OptimizeResult, type OptimizedValue, type StartReport } from "./optimize";
export { spreadAnalysis, spreadSteps, type SpreadOptions, type SpreadResult } from "./spread";
export { DesignRunStopped, checkStopSignal, stopIfAborted } from "./stop";
export { runToEnd, runInSlices, type SliceOptions } from "./slices";
export { yieldToEventLoop } from "../threads/event-loop";
export { resolveUncertainties, TRUNCATION_SPREADS, type UncertaintySpec, type ResolvedUncertainty, type SpreadDistribution } from "./uncertainty";
export { refinedHeadline, MAX_REFINED_PEAKS, TOUCHING_DB, type RefinedHeadline, type RefinedBand } from "./refined-headline";
export { designProblem, levelDb, merit, shownFigure, type DesignProblem, type DesignFigure, type DesignGrid } from "./problem";
export { numericParameters, designParameter, type DesignParameter, type ParameterBound } from "./parameters";
export { SEARCH_FACTOR, type SearchRange, type RangeEnd } from "./search-range";
export { riddersDerivative, type DerivativeEstimate, type DifferenceKind } from "./ridders-derivative";
export { brentRoot, type RootResult } from "./brent-root";
export { brentMinimum, type MinimumResult } from "./brent-minimum";
export { minimizeInBox, type BoxMinimizeOptions, type BoxMinimum } from "./nelder-mead";
export { quantileSorted } from "./quantile";
