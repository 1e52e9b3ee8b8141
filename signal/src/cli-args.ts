// Command-line arguments of `analyze` (src/cli.ts), parsed apart from the file system so they can be
// tested in-process. Every problem is a UsageError with a one-line message; the CLI exits 2 with it.

export class UsageError extends Error {
  override readonly name = "UsageError";
}

export const USAGE = "usage: analyze <file>... [--json] [--height-cm N]";
/** Standing heights the analysis accepts (cm), the same range as AnalyzeOptions.heightCm. */
export const HEIGHT_CM_MIN = 100;
export const HEIGHT_CM_MAX = 230;

export interface CliArgs {
  files: string[];
  json: boolean;
  heightCm?: number;
}

function parseHeightCm(text: string | undefined): number {
  if (text === undefined || text === "" || text.startsWith("--")) throw new UsageError(`--height-cm needs a value in cm (${USAGE})`);
  // Plain decimal only: "1e2", "0x64", " 170" or "170cm" are refused rather than guessed at.
  if (!/^\d+(\.\d+)?$/.test(text)) throw new UsageError(`--height-cm: "${text}" is not a number of centimetres`);
  const cm = Number(text);
  if (cm < HEIGHT_CM_MIN || cm > HEIGHT_CM_MAX) throw new UsageError(`--height-cm: ${text} is outside ${HEIGHT_CM_MIN}–${HEIGHT_CM_MAX} cm`);
  return cm;
}

export function parseCliArgs(argv: readonly string[]): CliArgs {
  const files: string[] = [];
  let json = false;
  let heightCm: number | undefined;
  for (let i = 0; i < argv.length; i++) {
    const a = argv[i]!;
    if (a === "--json") json = true;
    else if (a === "--height-cm" || a.startsWith("--height-cm=")) {
      if (heightCm !== undefined) throw new UsageError("--height-cm is given twice");
      heightCm = parseHeightCm(a === "--height-cm" ? argv[++i] : a.slice("--height-cm=".length));
    } else if (a.startsWith("--")) throw new UsageError(`unknown option ${a} (${USAGE})`);
    else files.push(a);
  }
  if (files.length === 0) throw new UsageError(USAGE);
  return heightCm === undefined ? { files, json } : { files, json, heightCm };
}
