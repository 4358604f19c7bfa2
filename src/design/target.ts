import { QuietframeError } from "../errors";
import { parseQuantity } from "../units";
import { levelDb, type DesignFigure } from "./problem";

/**
 * A target for a figure as a user writes it: a margin "3 dB" (or 3), a reach ratio 1.5, a noise
 * 1e-36 (or "1e-36 m²/Hz", in the budget's unit). Returned on the merit scale of problem.ts
 * (dB, higher is better), so "reaching" a target is one comparison for every figure.
 */
export function targetMerit(figure: DesignFigure, raw: unknown, path: string): { value: number; merit: number } {
  let value: number;
  if (figure.unit === "dB") {
    value = typeof raw === "number" ? finite(raw, figure, path) : parseQuantity(raw, "decibel", path);
  } else {
    const text = typeof raw === "string" ? raw.trim() : raw;
    const unit = figure.unit;
    const bare = typeof text === "string" && unit !== "" && text.endsWith(unit) ? text.slice(0, -unit.length).trim() : text;
    value = typeof bare === "number" ? finite(bare, figure, path) : typeof bare === "string" && /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/.test(bare) ? Number(bare) : NaN;
    if (!(value > 0) || !Number.isFinite(value)) {
      throw new QuietframeError({ path, value: raw, problem: `is not a target for the ${figure.kind === "noise-at" ? "noise" : "ratio"}`, allowed: allowedText(figure) });
    }
  }
  const level = levelDb(figure, value);
  return { value, merit: figure.better === "higher" ? level : -level };
}

function finite(x: number, figure: DesignFigure, path: string): number {
  if (!Number.isFinite(x)) throw new QuietframeError({ path, value: x, problem: "is not a finite number", allowed: allowedText(figure) });
  return x;
}

function allowedText(figure: DesignFigure): string {
  if (figure.unit === "dB") return 'a margin in dB such as "3 dB" (or the number 3)';
  if (figure.unit === "") return "a ratio above 0 such as 1.5";
  return `a noise level above 0 in ${figure.unit}, such as 1e-36 or "1e-36 ${figure.unit}"`;
}
