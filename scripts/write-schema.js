"use strict";
// Writes the files generated from the compiled component registry: the set-up JSON Schema,
// the sweep JSON Schema beside it, and the component reference. Run through `npm run schema`, which builds first; tests fail
// if a committed copy is stale.
const fs = require("node:fs");
const path = require("node:path");

const root = path.join(__dirname, "..");
const { setupJsonSchema } = require(path.join(root, "dist", "src", "setup", "schema.js"));
const { sweepJsonSchema } = require(path.join(root, "dist", "src", "sweep", "schema.js"));
const { componentReferenceMarkdown } = require(path.join(root, "dist", "src", "setup", "component-docs.js"));

function write(relative, text) {
  const target = path.join(root, relative);
  fs.mkdirSync(path.dirname(target), { recursive: true });
  fs.writeFileSync(target, text);
  process.stdout.write(`wrote ${relative}\n`);
}

write("schema/setup.schema.json", JSON.stringify(setupJsonSchema(), null, 2) + "\n");
write("schema/sweep.schema.json", JSON.stringify(sweepJsonSchema(), null, 2) + "\n");
write("docs/components.md", componentReferenceMarkdown());
