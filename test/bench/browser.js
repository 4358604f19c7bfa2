"use strict";
/**
 * 4. Widget latency in headless Chromium, on a standalone page with a 1,000-point,
 * six-term budget (examples/cryogenic-membrane.json).
 *
 * A move is: set the temperature slider to a new position and dispatch `input`, as a drag
 * does. An idle widget starts the update in a microtask, computes the budget with the same
 * model code as Node, hands the new values to the Vega view and awaits its runAsync (the
 * canvas is redrawn when that resolves), then dispatches "quietframe-drawn" on its element.
 * The fingerprint (SHA-256 of the curves) is published afterwards, in a task after the next
 * frame, together with the "ready" status. End points, timed in the page with performance.now():
 *   "chart"   the "quietframe-drawn" listener (the canvas holds the new curves);
 *   "frame"   a task queued from the first requestAnimationFrame callback after that: it runs
 *             once the rendering step that follows the update (style, layout, paint of the
 *             new canvas) is done on the main thread, so the new chart is on its way to screen
 *             (the fingerprint task, queued just before it, is included);
 *   "settled" the MutationObserver callback for the status attribute set with the fingerprint.
 * Baseline, interleaved move by move: an empty input→rAF round trip on the same page
 * (a listener that only requests a frame): one frame of the page's clock, the latency a
 * widget that waits for a frame before computing starts with. Each move and each baseline
 * starts at a random phase of the frame clock.
 */
const { mkdtempSync, readFileSync, rmSync, writeFileSync, existsSync } = require("node:fs");
const { tmpdir } = require("node:os");
const { join } = require("node:path");
const { pathToFileURL } = require("node:url");
const { ROOT, dist } = require("./lib/repo");
const { median, quantile, nowMs, calibrate, sample } = require("./lib/timing");

const CHROMIUM = process.env.QUIETFRAME_CHROMIUM ?? "/usr/bin/chromium";
// As the browser suites launch it.
const CHROMIUM_ARGS = [
  "--headless",
  "--no-sandbox",
  "--disable-gpu",
  "--disable-quic",
  "--no-first-run",
  "--disable-background-networking",
  "--disable-component-update",
  "--disable-sync",
  "--disable-dev-shm-usage",
];

const MOVES = 200;
const TARGET = "membrane.temperature";
const WIDGET = ".quietframe-explorer";

function benchState() {
  const { createExplorerState, computeExplorer } = dist("widgets/explorer/model");
  const setup = JSON.parse(readFileSync(join(ROOT, "examples", "cryogenic-membrane.json"), "utf8"));
  const state = createExplorerState(setup, {
    controls: [
      { target: TARGET, label: "bath temperature", min: "10 mK", max: "300 K" },
      { target: "cavity.photons", label: "intracavity photons", min: 1e4, max: 1e8 },
    ],
    settings: { grid: { from: "1.1 MHz", to: "1.3 MHz", points: 1000 } },
  });
  const computation = computeExplorer(state);
  return { state, computation };
}

/** Model time per update in Node (the part of a move that is not the chart): computeExplorer at 1,000 points. */
function modelMsInNode(state) {
  const { computeExplorer } = dist("widgets/explorer/model");
  const values = [`${0.5} K`, `${7} K`, `${60} K`];
  let k = 0;
  const fn = () => computeExplorer({ ...state, values: { ...state.values, [TARGET]: values[k++ % values.length] } });
  for (let i = 0; i < 10; i++) fn();
  const reps = calibrate(fn, 60);
  return median(Array.from({ length: 7 }, () => sample(fn, reps)));
}

/** Runs in the page: interleaved baseline round trips and widget moves. */
async function inPageLatency({ moves, target, widgetSelector, seed }) {
  let s = seed >>> 0;
  const random = () => {
    // xorshift32: a fixed sequence of frame phases and slider positions.
    s ^= s << 13;
    s >>>= 0;
    s ^= s >>> 17;
    s ^= s << 5;
    s >>>= 0;
    return s / 4294967296;
  };
  const frame = () => new Promise((resolve) => requestAnimationFrame(() => resolve(performance.now())));
  const sleep = (ms) => new Promise((resolve) => setTimeout(resolve, ms));
  // Resolves with [the next animation frame callback, a task queued from it] (performance.now()).
  const painted = () =>
    new Promise((resolve) =>
      requestAnimationFrame(() => {
        const raf = performance.now();
        setTimeout(() => resolve([raf, performance.now()]), 0);
      }),
    );
  const element = document.querySelector(widgetSelector);
  const slider = element.querySelector(`input[type=range][data-target="${target}"]`);
  const steps = Number(slider.max);

  const dummy = document.createElement("input");
  dummy.type = "range";
  dummy.hidden = true;
  document.body.append(dummy);
  let baselineDone;
  dummy.addEventListener("input", () => requestAnimationFrame(() => baselineDone(performance.now())));

  // The status is set last, with the fingerprint (or alone, when a value is refused).
  const statusSet = () =>
    new Promise((resolve) => {
      const names = new Set();
      const observer = new MutationObserver((records) => {
        for (const r of records) names.add(r.attributeName);
        if (!names.has("data-quietframe-status")) return;
        observer.disconnect();
        resolve({ at: performance.now(), status: element.getAttribute("data-quietframe-status"), names: [...names] });
      });
      observer.observe(element, { attributes: true, attributeFilter: ["data-quietframe-fingerprint", "data-quietframe-status"] });
    });
  const drawn = () => new Promise((resolve) => element.addEventListener("quietframe-drawn", () => resolve(performance.now()), { once: true }));

  // Optional breakdown of a move, by wrapping two of the widget's non-public members
  // (update: the frame callback's work; chart.show: the Vega changeset and runAsync). If
  // they are renamed the breakdown is left out and the end-to-end figures stand.
  const marks = { update: NaN, showStart: NaN, showEnd: NaN };
  let instrumented = false;
  const widget = window.quietframeRuntime?.widgets?.[0];
  if (widget && typeof widget.update === "function" && widget.chart && typeof widget.chart.show === "function") {
    const update = widget.update.bind(widget);
    const show = widget.chart.show.bind(widget.chart);
    widget.update = () => {
      if (Number.isNaN(marks.update)) marks.update = performance.now();
      return update();
    };
    widget.chart.show = async (input) => {
      marks.showStart = performance.now();
      try {
        return await show(input);
      } finally {
        marks.showEnd = performance.now();
      }
    };
    instrumented = true;
  }
  const split = { wait: [], model: [], chart: [], after: [] };

  const baseline = [];
  const chart = [];
  const framed = [];
  const nextFrame = [];
  const settled = [];
  let refused = 0;
  let position = Number(slider.value);
  for (let i = 0; i < moves; i++) {
    await frame();
    await sleep(random() * 16);
    const done = new Promise((resolve) => (baselineDone = resolve));
    const b0 = performance.now();
    dummy.dispatchEvent(new Event("input", { bubbles: true }));
    baseline.push((await done) - b0);

    await frame();
    await sleep(random() * 16);
    let next = position;
    while (next === position) next = Math.floor(random() * (steps + 1));
    position = next;
    slider.value = String(position);
    const statusP = statusSet();
    const drawnP = drawn();
    marks.update = marks.showStart = marks.showEnd = NaN;
    const t0 = performance.now();
    slider.dispatchEvent(new Event("input", { bubbles: true }));
    const first = await Promise.race([drawnP.then((at) => ({ at })), statusP.then(() => ({ at: NaN }))]);
    if (Number.isNaN(first.at)) {
      // Refused: no chart drawn; the move is counted as refused and not timed.
      refused++;
      await statusP;
      continue;
    }
    const [tf, t2] = await painted();
    const result = await statusP;
    if (result.status !== "ready" || !result.names.includes("data-quietframe-fingerprint")) refused++;
    chart.push(first.at - t0);
    framed.push(t2 - t0);
    nextFrame.push(tf - first.at);
    settled.push(result.at - t0);
    if (instrumented && !Number.isNaN(marks.showEnd)) {
      split.wait.push(marks.update - t0);
      split.model.push(marks.showStart - marks.update);
      split.chart.push(marks.showEnd - marks.showStart);
      split.after.push(first.at - marks.showEnd);
    }
  }
  dummy.remove();
  return { baseline, chart, framed, nextFrame, settled, refused, split: instrumented ? split : undefined, finalPosition: position, fingerprint: element.getAttribute("data-quietframe-fingerprint") };
}

async function runBrowserBench(log = () => undefined) {
  if (!existsSync(CHROMIUM)) throw new Error(`Chromium not found at ${CHROMIUM} (Debian package "chromium"; QUIETFRAME_CHROMIUM overrides the path)`);
  const { chromium } = require("playwright-core");
  const { standalonePage } = dist("widgets/explorer/html");
  const { explorerFigures } = dist("widgets/explorer/figures");
  const { resolveControls, sliderValue, writeValue } = dist("widgets/core/controls/setup-controls");
  const { computeExplorer } = dist("widgets/explorer/model");

  log("browser: building the page");
  const { state, computation } = benchState();
  const terms = computation.evaluation.budget.terms.length;
  const points = computation.evaluation.budget.frequencies.length;
  const figures = await explorerFigures(computation, state, { scale: 1 });
  const dir = mkdtempSync(join(tmpdir(), "quietframe-bench-browser-"));
  const pageFile = join(dir, "page.html");
  const html = standalonePage(state, computation, figures);
  writeFileSync(pageFile, html);

  let context;
  try {
    log("browser: launching Chromium");
    context = await chromium.launchPersistentContext(join(dir, "profile"), { executablePath: CHROMIUM, headless: true, args: CHROMIUM_ARGS, timeout: 60_000 });
    const page = context.pages()[0] ?? (await context.newPage());
    page.setDefaultTimeout(60_000);
    const pageErrors = [];
    page.on("pageerror", (e) => pageErrors.push(e.message));
    page.on("console", (m) => {
      if (m.type() === "error") pageErrors.push(m.text());
    });
    // Everything is inline; nothing may leave the machine.
    await page.route("**/*", (route) => (/^(file|data|blob):/.test(route.request().url()) ? route.continue() : route.abort()));
    // From navigation start to the first widget reporting "ready" (runtime parsed, model computed, chart drawn).
    await page.addInitScript(() => {
      const watch = new MutationObserver(() => {
        const el = document.querySelector(".quietframe-explorer[data-quietframe-status]");
        const status = el?.getAttribute("data-quietframe-status");
        if (status === "ready" || status === "error") {
          window.__benchBootMs = performance.now();
          window.__benchBootStatus = status;
          watch.disconnect();
        }
      });
      watch.observe(document, { subtree: true, attributes: true, attributeFilter: ["data-quietframe-status"] });
    });
    log("browser: loading the page");
    await page.goto(pathToFileURL(pageFile).href);
    await page.waitForSelector(`${WIDGET}[data-quietframe-status="ready"]`);
    const boot = await page.evaluate(() => ({ ms: window.__benchBootMs, status: window.__benchBootStatus, visibility: document.visibilityState }));
    if (boot.visibility !== "visible") log(`browser: page visibility is ${boot.visibility}; the widget then schedules with setTimeout instead of rAF`);

    // Warm-up moves (JIT, Vega's first changeset), not counted.
    await page.evaluate(inPageLatency, { moves: 10, target: TARGET, widgetSelector: WIDGET, seed: 7 });
    log(`browser: ${MOVES} moves`);
    const t0 = nowMs();
    const r = await page.evaluate(inPageLatency, { moves: MOVES, target: TARGET, widgetSelector: WIDGET, seed: 12345 });
    const loopSeconds = (nowMs() - t0) / 1000;

    // The page must show what Node computes for the final slider position.
    const [control] = resolveControls(
      state.setup,
      state.controls.filter((c) => c.target === TARGET),
    );
    const finalValue = writeValue(control, sliderValue(control, r.finalPosition));
    const expected = computeExplorer({ ...state, values: { ...state.values, [TARGET]: finalValue } }).fingerprint;

    const summary = (xs) => ({ median: median(xs), p95: quantile(xs, 0.95), max: Math.max(...xs) });
    return {
      points,
      terms,
      pageBytes: Buffer.byteLength(html),
      bootMs: boot.ms,
      bootStatus: boot.status,
      moves: MOVES,
      refused: r.refused,
      chart: summary(r.chart),
      frame: summary(r.framed),
      settled: summary(r.settled),
      // From the drawn chart to the next animation frame callback (before that frame's paint).
      drawnToFrame: summary(r.nextFrame),
      baseline: summary(r.baseline),
      chartOverBaseline: median(r.chart) / median(r.baseline),
      // Medians of the parts of a move: wait (input → update starts), model (computeExplorer
      // and bookkeeping, update → chart.show), chart (chart.show: changeset + runAsync), after (→ drawn event).
      split: r.split && Object.fromEntries(Object.entries(r.split).map(([k, xs]) => [k, { median: median(xs), p95: quantile(xs, 0.95) }])),
      fingerprintMatchesNode: r.fingerprint === expected,
      // Without the in-page breakdown, at least the model's share, timed in Node.
      modelMsNode: r.split ? undefined : modelMsInNode(state),
      loopSeconds,
      pageErrors,
    };
  } finally {
    await context?.close();
    rmSync(dir, { recursive: true, force: true });
  }
}

module.exports = { runBrowserBench };

if (require.main === module) {
  runBrowserBench((s) => console.error(s)).then(
    (r) => console.log(JSON.stringify(r, null, 2)),
    (e) => {
      console.error(e);
      process.exitCode = 1;
    },
  );
}
