import { QuietframeError } from "../errors";

/**
 * JSON.parse with an error that says where: line and column (1-based) of the problem.
 * `source` names the file or field the text came from.
 */
export function parseJsonText(text: string, source: string): unknown {
  try {
    return JSON.parse(text);
  } catch (e) {
    const message = e instanceof Error ? e.message : String(e);
    const position = reportedPosition(message) ?? firstSyntaxError(text);
    const { line, column } = lineColumn(text, position);
    throw new QuietframeError({
      path: source,
      problem: `malformed JSON at line ${line}, column ${column}: ${shortReason(message)}`,
      allowed: "a JSON document (RFC 8259)",
    });
  }
}

function reportedPosition(message: string): number | undefined {
  const m = /at position (\d+)/.exec(message);
  return m ? Number(m[1]) : undefined;
}

/** The engine's reason without its copy of the document (which may span lines). */
function shortReason(message: string): string {
  return message
    .replace(/\s*(in|after) JSON at position \d+.*$/s, "")
    .replace(/,\s*(\.\.\.)?".*" is not valid JSON$/s, "")
    .replace(/\s+/g, " ");
}

export function lineColumn(text: string, position: number): { line: number; column: number } {
  let line = 1;
  let column = 1;
  for (let i = 0; i < Math.min(position, text.length); i++) {
    if (text[i] === "\n") {
      line++;
      column = 1;
    } else {
      column++;
    }
  }
  return { line, column };
}

/**
 * Offset of the first character that breaks the JSON grammar (RFC 8259), for engines whose
 * messages omit it. Only called after JSON.parse has failed, so it only has to find where.
 */
export function firstSyntaxError(text: string): number {
  let i = 0;
  const ws = (): void => {
    while (i < text.length && " \t\n\r".includes(text[i])) i++;
  };
  const fail = (): never => {
    throw i;
  };
  const literal = (word: string): void => {
    for (const ch of word) {
      if (text[i] !== ch) fail();
      i++;
    }
  };
  const string = (): void => {
    if (text[i] !== '"') fail();
    i++;
    while (i < text.length && text[i] !== '"') {
      if (text.charCodeAt(i) < 0x20) fail();
      if (text[i] === "\\") {
        i++;
        if (text[i] === "u") {
          for (let k = 1; k <= 4; k++) if (!/[0-9a-fA-F]/.test(text[i + k] ?? "")) (i = i + k), fail();
          i += 5;
          continue;
        }
        if (!'"\\/bfnrt'.includes(text[i] ?? "x")) fail();
      }
      i++;
    }
    if (text[i] !== '"') fail();
    i++;
  };
  const number = (): void => {
    const m = /^-?(0|[1-9]\d*)(\.\d+)?([eE][+-]?\d+)?/.exec(text.slice(i));
    if (!m || m[0] === "" || m[0] === "-") fail();
    i += m![0].length;
  };
  const value = (): void => {
    ws();
    const c = text[i];
    if (c === "{") {
      i++;
      ws();
      if (text[i] === "}") return void i++;
      for (;;) {
        ws();
        string();
        ws();
        if (text[i] !== ":") fail();
        i++;
        value();
        ws();
        if (text[i] === ",") {
          i++;
          continue;
        }
        if (text[i] === "}") return void i++;
        fail();
      }
    } else if (c === "[") {
      i++;
      ws();
      if (text[i] === "]") return void i++;
      for (;;) {
        value();
        ws();
        if (text[i] === ",") {
          i++;
          continue;
        }
        if (text[i] === "]") return void i++;
        fail();
      }
    } else if (c === '"') string();
    else if (c === "t") literal("true");
    else if (c === "f") literal("false");
    else if (c === "n") literal("null");
    else number();
  };
  try {
    value();
    ws();
    if (i < text.length) fail();
  } catch (at) {
    if (typeof at === "number") return at;
    throw at;
  }
  return text.length;
}
