#!/usr/bin/env node
import { runCli } from "./run";

process.exitCode = runCli(process.argv.slice(2), {
  out: (s) => process.stdout.write(s),
  err: (s) => process.stderr.write(s),
});
