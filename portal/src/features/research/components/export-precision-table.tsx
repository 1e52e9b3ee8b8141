import { ErrorState, LoadingState, Table, Td, Th } from "@/components/ui";
import { useExportRules } from "../api/export-rules";

/** The rounding each metric gets in the export, with the reason and source, as the server applies it. */
export function ExportPrecisionTable() {
  const rules = useExportRules();
  if (rules.isPending) return <LoadingState label="Loading the export rules…" />;
  if (rules.isError) return <ErrorState title="The export rules could not be loaded" error={rules.error} onRetry={() => void rules.refetch()} />;
  const { metrics, countStep, studyClock } = rules.data;
  return (
    <details className="rounded-lg border border-line bg-sand p-4">
      <summary className="cursor-pointer font-semibold text-ink">How precisely each value is exported</summary>
      <p className="mt-2 text-sm text-ink-soft">
        Exact values can be matched against clinical screens, so every value is rounded to a step no finer than a clinician
        would act on. Counts behind each value are given to the nearest {countStep}. Study weeks come in blocks of{" "}
        {studyClock.blockWeeks} weeks (week {studyClock.capWeeks} and later as {studyClock.capWeeks}), and walks of the last{" "}
        {studyClock.releaseLagDays} days are held back, so no enrolment date can be worked out from an export.
      </p>
      <Table caption="Export precision per metric" className="mt-3">
        <thead>
          <tr>
            <Th>Metric</Th>
            <Th className="text-right">Rounded to</Th>
            <Th>Why</Th>
          </tr>
        </thead>
        <tbody>
          {metrics.map((m) => (
            <tr key={m.key}>
              <Td className="font-semibold">{m.label}</Td>
              <Td className="whitespace-nowrap text-right tabular">
                {m.step.toFixed(m.decimals)} {m.unit === "1" || m.unit.startsWith("{") ? "" : m.unit}
              </Td>
              <Td className="text-sm text-ink-soft">{m.why}</Td>
            </tr>
          ))}
        </tbody>
      </Table>
    </details>
  );
}
