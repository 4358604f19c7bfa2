import { QuietframeError } from "../errors";
import { parseOptions } from "./options";
import { installKernelSpec, KERNEL_DISPLAY_NAME, KERNEL_NAME } from "../../widgets/kernel/kernel-spec";
import { findJupyterPython } from "./jupyter-python";
import type { CliIo } from "./io";

/** `quietframe kernel install`: registers the quietframe kernel (tslab with comms) with Jupyter. */

export const KERNEL_USAGE = `  quietframe kernel install [--user | --prefix DIR] [--python PATH]
      Registers the "${KERNEL_DISPLAY_NAME}" kernel (${KERNEL_NAME}): TypeScript cells with
      live widgets. --user (default unless root): your own Jupyter; --prefix DIR: DIR/share/jupyter;
      --python: the Python your Jupyter runs on (default: the one that runs the jupyter command
      on PATH, else the active virtual environment's, else python3).
`;

export function kernelCommand(args: string[], io: CliIo): number {
  const [sub, ...rest] = args;
  if (sub !== "install") {
    throw new QuietframeError({ path: "kernel", value: sub ?? "", problem: "is not a kernel subcommand", allowed: "install", choices: ["install"] });
  }
  const { values } = parseOptions("kernel install", rest, { user: { type: "boolean" }, prefix: { type: "string" }, python: { type: "string" } }, false);
  if (values.user && values.prefix !== undefined)
    throw new QuietframeError({ path: "--prefix", value: values.prefix, problem: "cannot be combined with --user", allowed: "one of --user or --prefix DIR" });
  const python = findJupyterPython({ python: values.python }).command;
  const dir = installKernelSpec({ user: values.user, prefix: values.prefix, python });
  io.out(`Installed the ${KERNEL_DISPLAY_NAME} kernel spec (${KERNEL_NAME}) in ${dir}\n`);
  return 0;
}
