import { readdirSync, readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { escapeHtml } from "../../../../widgets/core/page/escape";
import { SAFETY_NOTE_TEXT, safetyNoteHtml } from "../../../../widgets/core/page/safety-note";
import { loadWidgetState, WIDGET_KINDS } from "../../../../widgets/registry";

/**
 * Every widget kind's fragment carries the standing safety note once, as a child of the root
 * outside the static fallback (the live views hide only the fallback, so the note stays), and
 * the README section it points to exists.
 */
const ROOT = join(__dirname, "..", "..", "..", "..");
const STATES = join(ROOT, "examples", "states");

describe("the standing safety note", () => {
  const files = readdirSync(STATES).filter((f) => f.endsWith(".json"));

  it("points to a Safety section that the README has", () => {
    expect(SAFETY_NOTE_TEXT).toMatch(/Safety section of the quietframe README/);
    expect(SAFETY_NOTE_TEXT).toMatch(/local rules and licensed practice/);
    expect(readFileSync(join(ROOT, "README.md"), "utf8")).toMatch(/^## Safety$/m);
  });

  it("every kind has a saved state here", () => {
    const kinds = new Set(files.map((f) => loadWidgetState(readFileSync(join(STATES, f), "utf8"), f).kind.name));
    expect([...kinds].sort()).toEqual(WIDGET_KINDS.map((k) => k.name).sort());
  });

  it.each(files)("%s: the fragment carries the note once, before and outside the fallback", (file) => {
    const { kind, loaded } = loadWidgetState(readFileSync(join(STATES, file), "utf8"), file);
    const html = kind.fragment(loaded, {});
    const note = safetyNoteHtml();
    expect(note).toContain(escapeHtml(SAFETY_NOTE_TEXT));
    expect(html.split(note)).toHaveLength(2);
    const fallback = html.indexOf('<div class="qf-fallback">');
    expect(fallback).toBeGreaterThan(0);
    expect(html.indexOf(note)).toBeLessThan(fallback);
    expect(html.indexOf(note)).toBeGreaterThan(html.indexOf(`class="${kind.view.className}"`));
  });
});
