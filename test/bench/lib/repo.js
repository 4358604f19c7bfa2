"use strict";
const { existsSync } = require("node:fs");
const { join, resolve } = require("node:path");

/** Repository root, found from this file (no machine paths). */
const ROOT = resolve(__dirname, "..", "..", "..");

/** Requires a module of the built package, e.g. dist("src/pipeline"). */
function dist(modulePath) {
  const file = join(ROOT, "dist", `${modulePath}.js`);
  if (!existsSync(file)) throw new Error(`dist/${modulePath}.js is missing: run "npm run build" first (npm run bench does)`);
  return require(file);
}

module.exports = { ROOT, dist };
