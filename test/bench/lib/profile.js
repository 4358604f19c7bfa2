"use strict";
/**
 * A sampling CPU profile of a function run for a while in this process (node:inspector),
 * summarised as the functions with the most self time, each with its hottest line, so a
 * benchmark can say where its time goes. Paths are shown relative to dist/.
 */
const inspector = require("node:inspector");
const { readFileSync } = require("node:fs");
const { findSourceMap } = require("node:module");
const { fileURLToPath } = require("node:url");
const { nowMs } = require("./timing");

// Source maps of dist/ are honoured for modules loaded after this (call before requiring dist).
process.setSourceMapsEnabled(true);

const fileLines = new Map();

/** The TypeScript source line (1-based) of a 1-based line of a built file, when a source map knows it. */
function originalLine(url, line) {
  try {
    const path = url.startsWith("file:") ? fileURLToPath(url) : url;
    const map = findSourceMap(path);
    if (!map) return undefined;
    if (!fileLines.has(path)) fileLines.set(path, readFileSync(path, "utf8").split("\n"));
    const text = fileLines.get(path)[line - 1] ?? "";
    const column = Math.max(0, text.search(/\S/));
    const entry = map.findEntry(line - 1, column);
    if (!entry || entry.originalSource === undefined) return undefined;
    const source = entry.originalSource.replace(/^.*?\/(src|widgets)\//, "$1/");
    return `${source}:${entry.originalLine + 1}`;
  } catch {
    return undefined;
  }
}

function post(session, method, params) {
  return new Promise((resolve, reject) => session.post(method, params, (err, result) => (err ? reject(err) : resolve(result))));
}

function shortUrl(url) {
  const i = url.lastIndexOf("/dist/");
  if (i >= 0) return url.slice(i + 6);
  return url.replace(/^.*\//, "") || "(native)";
}

/** Profiles fn (called repeatedly for about ms) and returns the top entries by self time. */
async function profile(fn, { ms = 2000, top = 8, intervalUs = 200 } = {}) {
  const session = new inspector.Session();
  session.connect();
  try {
    await post(session, "Profiler.enable");
    await post(session, "Profiler.setSamplingInterval", { interval: intervalUs });
    await post(session, "Profiler.start");
    const until = nowMs() + ms;
    while (nowMs() < until) {
      const r = fn();
      if (r && typeof r.then === "function") await r;
    }
    const { profile: p } = await post(session, "Profiler.stop");
    const byId = new Map(p.nodes.map((n) => [n.id, n]));
    const self = new Map();
    let total = 0;
    p.samples.forEach((id, i) => {
      const dt = p.timeDeltas[i] ?? 0;
      const node = byId.get(id);
      const { functionName, url, lineNumber } = node.callFrame;
      // The inspector's own message dispatch (stopping and serialising the profile) is not the code under test.
      if (functionName === "dispatch" && url === "") return;
      const key = `${functionName || "(anonymous)"} ${shortUrl(url)}:${lineNumber + 1}`;
      const entry = self.get(key) ?? { key, name: functionName || "(anonymous)", url, us: 0, lines: new Map(), line: lineNumber + 1 };
      entry.us += dt;
      total += dt;
      self.set(key, entry);
    });
    // Hottest line inside each function, from the per-line tick counts.
    for (const node of p.nodes) {
      const { functionName, url, lineNumber } = node.callFrame;
      const entry = self.get(`${functionName || "(anonymous)"} ${shortUrl(url)}:${lineNumber + 1}`);
      if (!entry) continue;
      for (const t of node.positionTicks ?? []) entry.lines.set(t.line, (entry.lines.get(t.line) ?? 0) + t.ticks);
    }
    return [...self.values()]
      .sort((a, b) => b.us - a.us)
      .slice(0, top)
      .map((e) => {
        const hottest = [...e.lines].sort((a, b) => b[1] - a[1])[0];
        return {
          share: e.us / total,
          name: e.name,
          where: e.key,
          source: originalLine(e.url, e.line),
          hottest: hottest ? (originalLine(e.url, hottest[0]) ?? `${shortUrl(e.url)}:${hottest[0]}`) : undefined,
        };
      });
  } finally {
    await post(session, "Profiler.disable").catch(() => undefined);
    session.disconnect();
  }
}

module.exports = { profile };
