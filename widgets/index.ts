export * from "./state/document";
export * from "./render/static";
export * from "./methods/methods";
export { explorerHtml, type ExplorerHtmlOptions } from "./html/explorer-html";
export { standalonePage, type StandaloneFigures } from "./html/standalone";
export { headlineSummary, type SummaryLine } from "./html/summary";
