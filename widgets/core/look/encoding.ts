/**
 * How a budget curve looks: its colour family comes from its role (what the noise is), its
 * dash from the name of its source, its shade from the kind of term within the role. Nothing
 * depends on a curve's position in the budget, so a term looks the same in every set-up that
 * has it.
 */
import { ROLE_COLOURS, shadeOf, type CurveRole } from "./palette";

/** A curve as the budget table names it: its id and label (a term's label is "<source>: <kind>"). */
export interface CurveName {
  readonly id: string;
  readonly label: string;
}

export interface CurveStyle {
  readonly role: CurveRole;
  /** "#RRGGBB". */
  readonly colour: string;
  /** Vega stroke-dash array in pixels; [1, 0] is solid. */
  readonly dash: readonly number[];
  /** Line width in pixels. */
  readonly width: number;
}

export const SOLID: readonly number[] = [1, 0];

/**
 * The dashes a source can take. Solid is kept for the total and the references' edges, so
 * every term is recognisably a part of the total.
 */
export const SOURCE_DASHES: readonly (readonly number[])[] = [
  [7, 3],
  [2, 2.5],
  [9, 3, 2, 3],
  [4, 2.5],
  [12, 4],
  [6, 2, 1.5, 2, 1.5, 2],
];

const TOTAL_WIDTH = 2.2;
const TERM_WIDTH = 1.5;
const REFERENCE_WIDTH = 1.2;
const ZERO_POINT_DASH: readonly number[] = [1.5, 3];

/** The budget's reference curves by id (src/physics/mechanics.ts, src/components/interferometer.ts). */
const REFERENCE_ROLES: Readonly<Record<string, CurveRole>> = { sql: "sql", "zero-point": "zero-point", thermal: "thermal" };

/** True for the total and the reference curves, which are not budget terms. */
export function isReferenceId(id: string): boolean {
  return id in REFERENCE_ROLES;
}

/**
 * The role of a budget term, from the words the engine's components give their noise inputs
 * (src/components/*.ts: "amplitude quadrature", "phase quadrature", "squeezed light",
 * "internal loss", "detection vacuum", "thermal force", "spin decoherence noise", …). A light
 * source's amplitude quadrature drives the body (back-action), its phase quadrature is read
 * out (imprecision); a term of both quadratures together is quantum light.
 */
export function termRole(name: CurveName): CurveRole {
  if (name.id === "total") return "total";
  const reference = REFERENCE_ROLES[name.id];
  if (reference) return reference;
  const kind = termKind(name.label).toLowerCase();
  if (/\bloss\b|vacuum/.test(kind)) return "loss-vacuum";
  if (/thermal|decoherence|spin noise/.test(kind)) return "thermal";
  if (kind.includes("+") || /squeezed|entangled/.test(kind)) return "quantum-light";
  if (kind.startsWith("amplitude quadrature")) return "back-action";
  if (kind.startsWith("phase quadrature")) return "imprecision";
  return "classical";
}

/** The source of a term: the component named before the first ": " (empty for the total and references). */
export function termSource(label: string): string {
  const i = label.indexOf(": ");
  return i < 0 ? "" : label.slice(0, i);
}

/** The kind of a term: what follows its source's name. */
export function termKind(label: string): string {
  const i = label.indexOf(": ");
  return i < 0 ? label : label.slice(i + 2);
}

export function curveStyle(name: CurveName): CurveStyle {
  const role = termRole(name);
  const base = ROLE_COLOURS[role];
  switch (role) {
    case "total":
      return { role, colour: base, dash: SOLID, width: TOTAL_WIDTH };
    case "sql":
      return { role, colour: base, dash: SOLID, width: REFERENCE_WIDTH };
    case "zero-point":
      return { role, colour: base, dash: ZERO_POINT_DASH, width: REFERENCE_WIDTH };
    default: {
      if (isReferenceId(name.id)) return { role, colour: base, dash: ZERO_POINT_DASH, width: REFERENCE_WIDTH };
      const source = termSource(name.label);
      return {
        role,
        colour: shadeOf(base, kindShade(role, termKind(name.label))),
        dash: SOURCE_DASHES[stringHash(source) % SOURCE_DASHES.length],
        width: TERM_WIDTH,
      };
    }
  }
}

/**
 * The shade of a term within its family: a quadrature pair of one source (a loss's amplitude
 * and phase parts, a bath's X and P) takes the tint and the base colour; a light source's
 * quadratures keep the base colour (their roles differ already); other kinds take one of the
 * two darker shades by their name, so two kinds of one source and role (a spin ensemble's two
 * decoherence terms) tell apart.
 */
function kindShade(role: CurveRole, kind: string): number {
  if (role === "imprecision" || role === "back-action" || role === "quantum-light") return 0;
  // Classical terms by where they enter (src/setup/classical-entry.ts), so a force and a displacement on one body, or
  // a laser's intensity and frequency noise on one cavity, tell apart (frequency noise is a change of the cavity's length).
  if (role === "classical") {
    const place = ["force", "displacement", "strain", "laser intensity", "laser frequency"].findIndex((p) => kind.startsWith(p));
    if (place >= 0) return place === 4 ? 1 : place;
  }
  if (/\((amplitude|X)\)$/.test(kind)) return 1;
  if (/\((phase|P)\)$/.test(kind)) return 0;
  return 2 + (stringHash(kind) % 2);
}

/** FNV-1a (32 bit) over the UTF-16 code units: a stable small hash, the same in every engine. */
export function stringHash(text: string): number {
  let h = 0x811c9dc5;
  for (let i = 0; i < text.length; i++) {
    h ^= text.charCodeAt(i);
    h = Math.imul(h, 0x01000193) >>> 0;
  }
  return h;
}
