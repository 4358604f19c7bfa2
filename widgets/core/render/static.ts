/** Node only: SVG (Vega, no browser) and PNG (resvg) of a Vega-Lite spec. */
import type * as Vega from "vega";
import type * as VegaLite from "vega-lite";
import type * as ResvgModule from "@resvg/resvg-js";
import { QuietframeError } from "../../../src/index";
import { useDejaVuWidths } from "./text-width";

/**
 * Figures for papers, rendered in Node from the very Vega-Lite spec the browser shows, so a
 * static figure and the live widget cannot drift apart. The renderers are loaded on first
 * use: importing this module costs nothing in a kernel that never exports a figure.
 */

export interface RenderSvgOptions {
  /** Receives Vega-Lite and Vega warnings (default: dropped, so notebooks stay quiet). */
  onWarning?: (message: string) => void;
}

// What Vega's SVG renderer writes for charts; <image> and <a> (hyperlinks) are left out on purpose.
const SVG_ELEMENTS = new Set(["svg", "g", "rect", "path", "line", "text", "tspan", "defs", "clipPath", "title", "circle"]);

/** SVG text of a Vega-Lite spec. Text is escaped by Vega's serializer; external resources are refused. */
export async function renderSvg(spec: Record<string, unknown>, options: RenderSvgOptions = {}): Promise<string> {
  const vega = require("vega") as typeof Vega;
  const vegaLite = require("vega-lite") as typeof VegaLite;
  useDejaVuWidths(vega);
  if (typeof spec !== "object" || spec === null || Array.isArray(spec)) {
    throw new QuietframeError({ path: "spec", value: spec, problem: "must be an object", allowed: "a Vega-Lite v5 spec such as budgetSpec() returns" });
  }
  const logger = collectingLogger(options.onWarning ?? (() => undefined));
  let compiled: Vega.Spec;
  try {
    // Vega tags the data rows it is given; compile a copy so the caller's spec stays as it was.
    compiled = vegaLite.compile(structuredClone(spec) as unknown as VegaLite.TopLevelSpec, { logger }).spec;
  } catch (e) {
    throw new QuietframeError({ path: "spec", problem: `is not a chart Vega-Lite can compile: ${messageOf(e)}`, allowed: "a Vega-Lite v5 spec such as budgetSpec() returns" });
  }
  const loader = vega.loader();
  // Data travel inline; a figure for a paper must not depend on files or the network.
  const refuse = (uri: string): Promise<never> => Promise.reject(new Error(`static figures load nothing (asked for ${uri})`));
  loader.load = refuse;
  loader.sanitize = refuse;
  const view = new vega.View(vega.parse(compiled), { renderer: "none", loader, logger, logLevel: vega.Warn });
  try {
    const svg = await view.toSVG();
    checkSvgElements(svg);
    return svg;
  } finally {
    view.finalize();
  }
}

export interface RenderPngOptions {
  /** Pixels per SVG pixel (default 2, print quality at the chart's size); 0.1 … 16. */
  scale?: number;
  /** Use the fonts installed on the system (default true). */
  loadSystemFonts?: boolean;
  /** Font files to load as well, e.g. a font shipped with a paper's sources. */
  fontFiles?: string[];
  /** Family used for "sans-serif" and unnamed text (default "DejaVu Sans", which has ħ, χ, √, Ω). */
  fontFamily?: string;
}

export const DEFAULT_PNG_SCALE = 2;
const MAX_PNG_SCALE = 16;
const MIN_PNG_SCALE = 0.1;
// 64 megapixels: about 256 MB of RGBA while rendering.
const MAX_PNG_PIXELS = 64e6;

/**
 * PNG bytes of an SVG. Without any usable font the text is left out (shapes still render);
 * pass `fontFiles` on systems without fonts. Size is round(scale × SVG size).
 */
export function renderPng(svg: string, options: RenderPngOptions = {}): Uint8Array {
  const { Resvg } = require("@resvg/resvg-js") as typeof ResvgModule;
  if (typeof svg !== "string" || !svg.trimStart().startsWith("<svg")) {
    throw new QuietframeError({ path: "svg", value: typeof svg === "string" ? svg : typeof svg, problem: "is not SVG text", allowed: "the text renderSvg() returns" });
  }
  const scale = options.scale ?? DEFAULT_PNG_SCALE;
  if (typeof scale !== "number" || !(scale >= MIN_PNG_SCALE && scale <= MAX_PNG_SCALE)) {
    throw new QuietframeError({ path: "scale", value: scale, problem: "is not a usable scale", allowed: `a number from ${MIN_PNG_SCALE} to ${MAX_PNG_SCALE}` });
  }
  const family = options.fontFamily ?? "DejaVu Sans";
  let resvg: InstanceType<typeof Resvg>;
  try {
    resvg = new Resvg(svg, {
      fitTo: { mode: "zoom", value: scale },
      font: {
        loadSystemFonts: options.loadSystemFonts ?? true,
        fontFiles: options.fontFiles ?? [],
        defaultFontFamily: family,
        sansSerifFamily: family,
      },
      logLevel: "off",
    });
  } catch (e) {
    throw new QuietframeError({ path: "svg", problem: `could not be read: ${messageOf(e)}`, allowed: "the text renderSvg() returns" });
  }
  const pixels = resvg.width * scale * resvg.height * scale;
  if (!(pixels <= MAX_PNG_PIXELS)) {
    throw new QuietframeError({
      path: "scale",
      value: scale,
      problem: `would make a ${Math.round(resvg.width * scale)} × ${Math.round(resvg.height * scale)} image`,
      allowed: `at most ${MAX_PNG_PIXELS / 1e6} megapixels; a smaller scale`,
    });
  }
  return new Uint8Array(resvg.render().asPng());
}

/** A widget's static figure: its Vega-Lite spec, SVG, PNG and the plotted numbers. */
export interface StaticFigures {
  readonly spec: Record<string, unknown>;
  readonly svg: string;
  readonly png: Uint8Array;
  /** The plotted numbers, exactly (shortest round-trip form). */
  readonly csv: string;
}

/** Spec, SVG, PNG and CSV of a figure: the SVG rendered from the spec, the PNG from the SVG. */
export async function renderFigures(spec: Record<string, unknown>, csv: string, options: RenderPngOptions & RenderSvgOptions = {}): Promise<StaticFigures> {
  const svg = await renderSvg(spec, options);
  return { spec, svg, png: renderPng(svg, options), csv };
}

/** Vega escapes all text and attributes; this keeps out elements a spec may ask for (images, links). */
function checkSvgElements(svg: string): void {
  for (const m of svg.matchAll(/<([A-Za-z][\w:.-]*)/g)) {
    if (!SVG_ELEMENTS.has(m[1])) {
      throw new QuietframeError({
        path: "spec",
        problem: `draws <${m[1]}> elements, which static figures do not contain`,
        allowed: "charts of lines, rules, points, areas, bars and text",
      });
    }
  }
}

function collectingLogger(warn: (message: string) => void): Vega.LoggerInterface {
  let level = 0;
  const say = (...args: readonly unknown[]): void => warn(args.map(String).join(" "));
  const logger = {
    level(value?: number) {
      if (value === undefined) return level;
      level = value;
      return logger;
    },
    error(...args: readonly unknown[]) {
      say(...args);
      return logger;
    },
    warn(...args: readonly unknown[]) {
      say(...args);
      return logger;
    },
    info: () => logger,
    debug: () => logger,
  };
  return logger as unknown as Vega.LoggerInterface;
}

function messageOf(e: unknown): string {
  return e instanceof Error ? e.message : String(e);
}
