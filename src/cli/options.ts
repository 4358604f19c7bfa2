/**
 * Command-line options for every command through node's parseArgs, with our own messages: an
 * unknown or misused option is a QuietframeError (exit status 1) that names the option, the
 * command's options and the nearest one, instead of node's parser text.
 */
import { parseArgs, type ParseArgsConfig } from "node:util";
import { QuietframeError } from "../errors";
import { didYouMean } from "../nearest-name";

type OptionSpecs = NonNullable<ParseArgsConfig["options"]>;
type Parsed<O extends OptionSpecs> = ReturnType<typeof parseArgs<{ args: string[]; options: O; allowPositionals: true; strict: true }>>;

/** Parses `args` for `quietframe <command>`; positionals are allowed unless said otherwise. */
export function parseOptions<const O extends OptionSpecs>(command: string, args: string[], options: O, allowPositionals = true): Parsed<O> {
  try {
    return parseArgs({ args, options, allowPositionals, strict: true }) as Parsed<O>;
  } catch (e) {
    throw optionError(command, e, options);
  }
}

/** `--from, --to, -o/--output`: the command's options as a user types them. */
export function optionList(options: OptionSpecs): string[] {
  return Object.entries(options).map(([name, spec]) => (spec.short ? `-${spec.short}/--${name}` : `--${name}`));
}

function optionError(command: string, e: unknown, options: OptionSpecs): unknown {
  const code = (e as NodeJS.ErrnoException | undefined)?.code;
  if (typeof code !== "string" || !code.startsWith("ERR_PARSE_ARGS_")) return e;
  const message = (e as Error).message;
  const named = /'(-{1,2}[^'\s=]*)/.exec(message)?.[1] ?? /'([^']*)'/.exec(message)?.[1] ?? "";
  const where = `quietframe ${command}`;
  const allowed = Object.keys(options).length ? optionList(options).join(", ") : "no options";
  if (code === "ERR_PARSE_ARGS_UNKNOWN_OPTION") {
    const hint = didYouMean(named.replace(/^-+/, ""), Object.keys(options)).replace(/"([^"]+)"/, '"--$1"');
    return new QuietframeError({ path: named, problem: `is not an option of ${where}${hint}`, allowed });
  }
  if (code === "ERR_PARSE_ARGS_UNEXPECTED_POSITIONAL") {
    return new QuietframeError({ path: "<arguments>", value: named, problem: `${where} takes no file or word arguments here`, allowed });
  }
  if (/argument missing/.test(message)) return new QuietframeError({ path: named, problem: "needs a value", allowed: `${named} <value>` });
  if (/does not take an argument/.test(message)) return new QuietframeError({ path: named, problem: "takes no value", allowed: `${named} alone` });
  if (/ambiguous/.test(message)) {
    return new QuietframeError({ path: named, problem: "is followed by a value that starts with '-', which reads as another option", allowed: `the value joined with '=', e.g. ${named}="-10 Hz"` });
  }
  return new QuietframeError({ path: named || where, problem: `is not used as ${where} expects`, allowed });
}
