/** Plain-text tables for the terminal: columns padded to their widest cell, numbers right-aligned. */

export function textTable(headers: readonly string[], rows: readonly (readonly string[])[], rightAligned: readonly boolean[] = []): string {
  const width = headers.map((h, c) => Math.max([...h].length, ...rows.map((r) => [...(r[c] ?? "")].length)));
  const line = (cells: readonly string[]): string =>
    cells
      .map((cell, c) => {
        const pad = " ".repeat(width[c] - [...cell].length);
        return rightAligned[c] ? pad + cell : cell + pad;
      })
      .join("  ")
      .trimEnd();
  return [line(headers), line(width.map((w) => "-".repeat(w))), ...rows.map(line)].join("\n") + "\n";
}

/** JSON text of a result: typed arrays as arrays, non-finite numbers as null (JSON has no NaN or ∞). */
export function resultJson(value: unknown): string {
  return (
    JSON.stringify(
      value,
      (_key, v: unknown) => {
        if (v instanceof Float64Array || v instanceof Uint8Array) return Array.from(v, (x) => (Number.isFinite(x) ? x : null));
        if (typeof v === "number" && !Number.isFinite(v)) return null;
        return v;
      },
      2,
    ) + "\n"
  );
}
