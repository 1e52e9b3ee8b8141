import { type SynthOptions, synthesizeSession } from "./synthesize-session";

/** Just the file texts of a synthetic session, keyed by file name (for demos and CLI fixtures). */
export function synthesizeSessionText(options: SynthOptions = {}): Record<string, string> {
  const out: Record<string, string> = {};
  for (const f of synthesizeSession(options).files) out[f.fileName] = f.text;
  return out;
}
