import { describe, expect, it } from "vitest";
import { computeEntangled, createEntangledState, loadEntangledState } from "../../../widgets/entangled/model";
import { ENTANGLED_CLASS, ENTANGLED_STATE_CLASS } from "../../../widgets/entangled/names";
import { entangledHtml } from "../../../widgets/entangled/html";
import { escapeHtml } from "../../../widgets/core/page/escape";
import { entangledPanel } from "../../../widgets/entangled/notebook";

const HOSTILE = `</script><script>alert("x")</script> "quoted" 'single' & <b>bold</b>`;

function scripts(html: string): { attrs: string; body: string }[] {
  return [...html.matchAll(/<script([^>]*)>([\s\S]*?)<\/script>/gi)].map((m) => ({ attrs: m[1], body: m[2] }));
}

describe("entangled panel HTML", () => {
  const state = createEntangledState({ squeezingDb: -9, efficiency1: 0.9, efficiency2: 0.85, title: `Pair ${HOSTILE}` });
  const html = entangledHtml(state, { includeRuntime: false });

  it("escapes the title everywhere it appears as text", () => {
    expect(html).not.toContain("<b>bold</b>");
    expect(html).not.toContain(`alert("x")</script>`);
    expect(html).toContain(escapeHtml(`Pair ${HOSTILE}`));
  });

  it("embeds the state as application/json that parses back to the same state", () => {
    const all = scripts(html);
    // The state script and the bootstrap: the hostile title cannot open another element.
    expect(all).toHaveLength(2);
    const json = all.find((s) => s.attrs.includes(ENTANGLED_STATE_CLASS));
    expect(json?.attrs).toContain(`type="application/json"`);
    expect(json?.body).not.toMatch(/</);
    expect(loadEntangledState(json?.body ?? "")).toEqual(state);
  });

  it("carries the numbers as text and as attributes in shortest round-trip form", () => {
    const c = computeEntangled(state);
    expect(html).toContain(`class="${ENTANGLED_CLASS}"`);
    expect(html).toContain(`data-duan-sum="${String(c.duanSum)}"`);
    expect(html).toContain(`data-log-negativity="${String(c.logNegativity)}"`);
    expect(html).toMatch(/Duan sum<\/dt><dd>[0-9.]+ \(separable states ≥ 2\): entangled/);
  });

  it("the notebook bundle has live HTML with a static SVG, a PNG and a text summary", async () => {
    const p = entangledPanel({ r: 0.8, efficiency1: 0.95, efficiency2: 0.9, bandwidth: 5e5, title: HOSTILE });
    const bundle = await p.bundle({ includeRuntime: false });
    const text = bundle["text/html"] as string;
    expect(text).toMatch(/<svg[\s>]/);
    expect(text).not.toContain("<b>bold</b>");
    const png = bundle["image/png"] as Uint8Array;
    expect([...png.subarray(0, 8)]).toEqual([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);
    const plain = bundle["text/plain"] as string;
    expect(plain).toContain(`Duan sum: ${Number(p.figures.duanSum.toPrecision(4))}`);
    expect(plain).toContain("Logarithmic negativity");
  });

  it("with the runtime, carries it exactly once", () => {
    const withRuntime = entangledHtml(state, { includeRuntime: true });
    expect(scripts(withRuntime)).toHaveLength(3);
  });
});
