#!/usr/bin/env node
import { runCliAsync } from "./run";

// Async because render and report wait for Vega; the exit code is set once the command ends.
runCliAsync(process.argv.slice(2), {
  out: (s) => process.stdout.write(s),
  err: (s) => process.stderr.write(s),
}).then(
  (code) => {
    process.exitCode = code;
  },
  (e: unknown) => {
    // Not a user problem but a bug: show the stack, as an uncaught error would.
    console.error(e);
    process.exitCode = 70;
  },
);
