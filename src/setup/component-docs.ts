import { COMPONENT_KINDS } from "../components/registry";
import type { ParamSpec } from "../components/types";
import { describeRange } from "./params";
import { entriesOf } from "./classical-noise";

/** Markdown reference of every component kind, generated from the registry so it cannot drift. */
export function componentReferenceMarkdown(): string {
  const out: string[] = [
    "# Component reference",
    "",
    "Generated from the component registry by `npm run schema`; do not edit by hand.",
    "Quantities are strings with units (see [setup-format.md](setup-format.md)); fractions, counts and plain numbers may also be JSON numbers.",
    "",
  ];
  for (const kind of COMPONENT_KINDS.values()) {
    out.push(`## \`${kind.type}\``, "", kind.summary, "");
    if (kind.params.length) {
      out.push("| parameter | kind | default | range | meaning |", "|---|---|---|---|---|");
      for (const p of kind.params) out.push(`| \`${p.name}\` | ${kindOf(p)} | ${defaultOf(p)} | ${rangeOf(p)} | ${escapeCell(p.doc)} |`);
      out.push("");
    } else {
      out.push("No parameters.", "");
    }
    out.push("| port | kind | meaning |", "|---|---|---|");
    for (const port of kind.ports) out.push(`| \`${port.name}\` | ${port.kind}${port.optional ? " (optional)" : ""} | ${escapeCell(port.doc)} |`);
    out.push("");
    const entries = entriesOf(kind);
    if (entries.length) out.push(`Classical noise (\`classicalNoise\`, see [setup-format.md](setup-format.md#classical-noise)) enters here as: ${entries.map((e) => `\`"${e}"\``).join(", ")}.`, "");
  }
  return out.join("\n");
}

function kindOf(p: ParamSpec): string {
  return p.kind === "choice" ? p.choices.map((c) => `"${c}"`).join(" / ") : p.kind;
}

function defaultOf(p: ParamSpec): string {
  if (p.default !== undefined) return `\`${JSON.stringify(p.default)}\``;
  return p.optional ? "optional" : "required";
}

function rangeOf(p: ParamSpec): string {
  return p.kind === "choice" ? "" : escapeCell(describeRange(p).startsWith("any ") ? "" : describeRange(p));
}

function escapeCell(s: string): string {
  return s.replace(/\|/g, "\\|");
}
