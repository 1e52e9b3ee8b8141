import { useState, type FormEvent } from "react";
import type { ChartMarker } from "@/components/charts/time-series-chart";
import { Button, FormMessage, Section, TextAreaField } from "@/components/ui";
import { describeError } from "@/lib/api-error";
import { formatCalendarDay } from "@/lib/calendar-day";
import { formatDateTime } from "@/lib/format";
import { createNoteInput, useCreateNote, useNotes, useTraining, type Note, type TrainingEntry } from "../api/notes";

const KIND_LABEL: Record<string, string> = {
  overground: "Overground walking",
  treadmill: "Treadmill",
  body_weight_support: "Body-weight-supported",
  balance: "Balance",
  strength: "Strength",
  other: "Other",
};

export function notesToMarkers(notes: Note[], training: TrainingEntry[]): ChartMarker[] {
  return [
    ...notes.map((n) => ({ t: new Date(n.createdAt), glyph: "N", label: `Note: ${n.body.slice(0, 80)}` })),
    ...training.map((t) => ({ t: new Date(`${t.performedOn}T12:00:00Z`), glyph: "T", label: `Training: ${KIND_LABEL[t.kind] ?? t.kind}, ${t.minutes} min` })),
  ];
}

export function NoteForm({ patientId, sessionId }: { patientId: string; sessionId?: string }) {
  const create = useCreateNote(patientId);
  const [body, setBody] = useState("");
  const [error, setError] = useState<string | null>(null);

  function onSubmit(e: FormEvent) {
    e.preventDefault();
    const parsed = createNoteInput.safeParse({ body, sessionId });
    if (!parsed.success) return setError(parsed.error.issues[0]?.message ?? "Check the note.");
    setError(null);
    create.mutate(parsed.data, { onSuccess: () => setBody("") });
  }

  return (
    <form onSubmit={onSubmit} className="no-print flex flex-col gap-3" aria-label="Write a note">
      <TextAreaField
        label={sessionId ? "Note about this session" : "New note"}
        value={body}
        onChange={(e) => setBody(e.target.value)}
        error={error}
        hint="Visible to the patient's care team. Not shared with researchers."
      />
      {create.isError ? <FormMessage tone="error">{describeError(create.error)}</FormMessage> : null}
      {create.isSuccess && !body ? <FormMessage tone="success">Note saved.</FormMessage> : null}
      <div>
        <Button type="submit" busy={create.isPending}>
          Save note
        </Button>
      </div>
    </form>
  );
}

/** Notes and training log in one date-ordered list, with the note form. */
export function NotesPanel({ patientId }: { patientId: string }) {
  const { data: notes } = useNotes(patientId);
  const { data: training } = useTraining(patientId);
  const entries = [
    ...notes.items.map((n) => ({ at: n.createdAt, kind: "note" as const, n })),
    ...training.items.map((t) => ({ at: `${t.performedOn}T12:00:00Z`, kind: "training" as const, t })),
  ].sort((a, b) => b.at.localeCompare(a.at));

  return (
    <Section title="Notes and training log" id="notes" description="Marked on the charts above: N for a note, T for a training session.">
      <div className="grid gap-5 lg:grid-cols-[3fr_2fr]">
        <div className="card p-4">
          {entries.length === 0 ? (
            <p className="text-ink-soft">No notes or training entries yet.</p>
          ) : (
            <ol className="flex flex-col divide-y divide-line">
              {entries.map((e) =>
                e.kind === "note" ? (
                  <li key={`n-${e.n.id}`} className="py-2.5">
                    <p className="text-xs text-ink-soft">
                      <span className="mr-1 rounded bg-sand-deep px-1 font-bold">N</span>
                      {formatDateTime(e.n.createdAt)}
                      {e.n.authorName ? ` · ${e.n.authorName}` : ""}
                    </p>
                    <p className="mt-1 whitespace-pre-wrap">{e.n.body}</p>
                  </li>
                ) : (
                  <li key={`t-${e.t.id}`} className="py-2.5">
                    <p className="text-xs text-ink-soft">
                      <span className="mr-1 rounded bg-moss-wash px-1 font-bold text-moss-deep">T</span>
                      {formatCalendarDay(e.t.performedOn)}
                    </p>
                    <p className="mt-1">
                      {KIND_LABEL[e.t.kind] ?? e.t.kind}, {e.t.minutes} min{e.t.description ? ` — ${e.t.description}` : ""}
                    </p>
                  </li>
                ),
              )}
            </ol>
          )}
        </div>
        <div className="card p-4">
          <NoteForm patientId={patientId} />
        </div>
      </div>
    </Section>
  );
}
