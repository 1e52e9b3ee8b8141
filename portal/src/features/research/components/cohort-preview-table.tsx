import { EmptyState, ErrorState, LoadingState, Table, Td, Th } from "@/components/ui";
import { conditionLabel, type CohortDefinition } from "../api/cohort-definition";
import { useCohortPreview, type CohortPreview } from "../api/preview-cohort";

export function suppressedText(k: number): string {
  return `suppressed group (n < ${k})`;
}

function Totals({ preview }: { preview: CohortPreview }) {
  const shown = preview.cells.filter((c) => !c.suppressed);
  const subjects = shown.reduce((sum, c) => sum + (c.subjects ?? 0), 0);
  const sessions = shown.reduce((sum, c) => sum + (c.sessions ?? 0), 0);
  const suppressed = preview.cells.length - shown.length;
  return (
    <p className="text-sm text-ink-soft">
      <span className="font-semibold text-ink tabular">{subjects}</span> subjects and{" "}
      <span className="font-semibold text-ink tabular">{sessions}</span> sessions in {shown.length} published{" "}
      {shown.length === 1 ? "group" : "groups"}; {suppressed} {suppressed === 1 ? "group" : "groups"} withheld.
    </p>
  );
}

export function CohortPreviewTable({ preview }: { preview: CohortPreview }) {
  if (preview.cells.length === 0) {
    return (
      <EmptyState title="No consenting subjects match this definition">
        Widen the conditions, age bands or weeks, then preview again.
      </EmptyState>
    );
  }
  return (
    <div className="grid gap-3">
      <Totals preview={preview} />
      <Table caption={`Subjects and sessions per condition and age band; groups under ${preview.k} subjects are suppressed and not named.`}>
        <thead>
          <tr>
            <Th>Condition</Th>
            <Th>Age band</Th>
            <Th className="text-right">Subjects</Th>
            <Th className="text-right">Sessions</Th>
          </tr>
        </thead>
        <tbody>
          {preview.cells.map((cell, index) =>
            cell.suppressed ? (
              // The server names neither the condition nor the age band of a withheld group.
              <tr key={`suppressed-${index}`}>
                <Td colSpan={4} className="bg-ochre-wash font-semibold text-ochre">
                  <span aria-hidden="true">⊘ </span>
                  {suppressedText(preview.k)}
                </Td>
              </tr>
            ) : (
              <tr key={`${cell.condition}|${cell.ageBand}`}>
                <Td className="font-semibold">{cell.condition ? conditionLabel(cell.condition) : "—"}</Td>
                <Td className="tabular">{cell.ageBand}</Td>
                <Td className="text-right tabular">{cell.subjects ?? "—"}</Td>
                <Td className="text-right tabular">{cell.sessions ?? "—"}</Td>
              </tr>
            ),
          )}
        </tbody>
      </Table>
    </div>
  );
}

/** Loading, error, empty and filled states of the preview for one submitted definition. */
export function CohortPreviewPanel({ definition }: { definition: CohortDefinition | null }) {
  const preview = useCohortPreview(definition);
  if (definition === null) {
    return (
      <p className="rounded-lg border border-dashed border-line bg-sand p-5 text-ink-soft">
        Choose a cohort above and select <strong className="text-ink">Preview cohort</strong> to see how many
        subjects each group holds before you export.
      </p>
    );
  }
  if (preview.isPending) return <LoadingState label="Counting consenting subjects…" />;
  if (preview.isError) {
    return <ErrorState title="The preview could not be made" error={preview.error} onRetry={() => void preview.refetch()} />;
  }
  return <CohortPreviewTable preview={preview.data} />;
}
