"use strict";
/**
 * Tolerance-map cell benchmark (built package), row 6c: one cell the way a map computes it now
 * (evaluateCell: the plan's SetupPreparer validated the set-up once, each cell writes its two
 * values into the validated set-up) against the way cells were computed before (the two values
 * written into a copy of the description, which is then prepared whole: figureOfSetup of
 * applyValues), interleaved, on cells spread over a 100 × 100 map of the squeezed cryogenic
 * membrane at 256 frequencies. Both ways must give the same bits on every cell timed; nothing
 * here asserts a time.
 */
const { readFileSync } = require("node:fs");
const { join } = require("node:path");
const { ROOT, dist } = require("./lib/repo");
const { compare } = require("./lib/timing");

const qf = dist("src/index");
const { resolveToleranceSpec } = dist("src/tolerance/spec");
const { cellValues, evaluateCell } = dist("src/tolerance/evaluate");
const { figureOfSetup } = dist("src/figures/of-setup");

const SIZE = 100;
const POINTS = 256;
/** Cells timed, on a diagonal through the map (stable and unstable ones alike). */
const CELLS = 25;

async function runCellPathBench(log) {
  const setup = JSON.parse(readFileSync(join(ROOT, "examples", "cryogenic-membrane-squeezed.json"), "utf8"));
  const { plan } = resolveToleranceSpec(setup, {
    x: { target: "squeezer.squeezing", from: "-15 dB", to: "0 dB", points: SIZE },
    y: { target: "cavity.inputCoupling", from: "50 %", to: "100 %", points: SIZE },
    grid: { from: "1.1 MHz", to: "1.3 MHz", points: POINTS },
    figure: { kind: "margin-at", frequency: "1.16 MHz" },
  });
  const frequencies = qf.logGrid(plan.grid);
  const cells = Array.from({ length: CELLS }, (_, k) => [Math.floor((k * (SIZE - 1)) / (CELLS - 1)), Math.floor((k * 37) % SIZE)]);
  const before = ([i, j]) => figureOfSetup(qf.applyValues(plan.setup, cellValues(plan, i, j)), plan.figure, frequencies);
  const now = ([i, j]) => evaluateCell(plan, frequencies, i, j);
  const identical = cells.every((c) => {
    const a = before(c);
    const b = now(c);
    return Object.is(a.value, b.value) && a.status === b.status && a.message === b.message;
  });
  let k = 0;
  let sink = 0;
  log(`cells: ${CELLS} cells of a ${SIZE}×${SIZE} map, the old path against the prepared one`);
  const r = compare(
    {
      before: () => {
        sink += before(cells[k++ % CELLS]).status;
      },
      prepared: () => {
        sink += now(cells[k++ % CELLS]).status;
      },
    },
    { rounds: 11, sampleMs: 150 },
  );
  return { cells: CELLS, points: POINTS, beforeMs: r.before.ms, preparedMs: r.prepared.ms, speedup: 1 / r.prepared.ratio, identical, sink };
}

function cellPathRows(c) {
  const fmt = (ms) => (ms >= 1 ? `${ms.toFixed(2)} ms` : `${(ms * 1e3).toFixed(0)} µs`);
  return [
    {
      id: "6c",
      measure: `tolerance-map cell (${c.points} pts): prepared once per map (SetupPreparer) vs each cell's set-up prepared whole`,
      result: `${c.speedup.toFixed(2)}× faster`,
      detail: [`before ${fmt(c.beforeMs)} · prepared ${fmt(c.preparedMs)} per cell (medians, ${c.cells} cells interleaved) · same bits on every cell: ${c.identical ? "yes" : "NO"}`],
      goal: "> 1×",
      met: c.identical ? (c.speedup > 1 ? "yes" : "NO") : "bits differ",
    },
  ];
}

module.exports = { runCellPathBench, cellPathRows };
