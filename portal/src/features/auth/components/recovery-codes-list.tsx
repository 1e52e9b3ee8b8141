import { useState } from "react";
import { Button, FormMessage } from "@/components/ui";

/**
 * The recovery codes, shown once: the server keeps only their digests. The person saves them
 * (download or copy) and says so before going on.
 */
export function RecoveryCodesList({ codes, accountLabel, onDone, doneLabel }: { codes: string[]; accountLabel?: string; onDone: () => void; doneLabel: string }) {
  const [stored, setStored] = useState(false);
  const [copied, setCopied] = useState(false);
  const text = [`Pendula recovery codes${accountLabel ? ` for ${accountLabel}` : ""}`, "Each code works once.", "", ...codes, ""].join("\n");

  function download() {
    const url = URL.createObjectURL(new Blob([text], { type: "text/plain" }));
    const a = document.createElement("a");
    a.href = url;
    a.download = "pendula-recovery-codes.txt";
    a.click();
    URL.revokeObjectURL(url);
  }

  return (
    <div className="flex flex-col gap-4">
      <FormMessage tone="success">Your authenticator app is set up.</FormMessage>
      <div>
        <h2 className="text-lg font-bold text-ink">Your recovery codes</h2>
        <p className="mt-1 text-ink-soft">
          If your phone is lost or broken, each of these codes lets you sign in once. Keep them somewhere safe and apart from your
          phone. Pendula will not show them again.
        </p>
      </div>
      <ol aria-label="Recovery codes" className="grid grid-cols-2 gap-2 rounded-lg border border-line bg-paper p-4 font-mono text-[1.05rem] tracking-wide text-ink">
        {codes.map((c) => (
          <li key={c}>{c}</li>
        ))}
      </ol>
      <div className="flex flex-wrap gap-2">
        <Button variant="secondary" size="sm" onClick={download}>
          Download as a text file
        </Button>
        <Button
          variant="secondary"
          size="sm"
          onClick={() => {
            void navigator.clipboard?.writeText(text).then(() => setCopied(true));
          }}
        >
          {copied ? "Copied" : "Copy"}
        </Button>
      </div>
      <label className="flex items-start gap-2 text-sm text-ink">
        <input type="checkbox" className="mt-1" checked={stored} onChange={(e) => setStored(e.target.checked)} />
        I have stored these codes somewhere safe.
      </label>
      <Button size="lg" disabled={!stored} onClick={onDone}>
        {doneLabel}
      </Button>
    </div>
  );
}
