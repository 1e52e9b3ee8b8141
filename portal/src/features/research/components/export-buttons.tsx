import { Button } from "@/components/ui";
import { describeError } from "@/lib/api-error";
import type { CohortDefinition } from "../api/cohort-definition";
import { useCohortExport, type ExportFormat } from "../api/download-cohort-export";

const FORMATS: Array<{ format: ExportFormat; label: string; hint: string }> = [
  { format: "csv", label: "Download CSV", hint: "One row per subject and session week, one column per metric." },
  { format: "fhir", label: "Download FHIR bundle", hint: "FHIR R4 Observations with UCUM units, one bundle per session." },
];

export function ExportButtons({ definition }: { definition: CohortDefinition | null }) {
  const exporter = useCohortExport();
  const disabled = definition === null || exporter.isPending;
  return (
    <div className="grid gap-3">
      <div className="flex flex-wrap gap-3">
        {FORMATS.map(({ format, label, hint }) => (
          <div key={format} className="grid max-w-xs gap-1">
            <Button
              variant="secondary"
              disabled={disabled}
              busy={exporter.isPending && exporter.variables?.format === format}
              onClick={() => definition && exporter.mutate({ definition, format })}
            >
              {label}
            </Button>
            <span className="text-xs text-ink-soft">{hint}</span>
          </div>
        ))}
      </div>
      {definition === null ? (
        <p className="text-sm text-ink-soft">Preview a cohort first; the export uses the same definition.</p>
      ) : null}
      <div aria-live="polite">
        {exporter.isSuccess ? (
          <p className="text-sm font-semibold text-moss-deep">
            <span aria-hidden="true">✓ </span>
            Saved {exporter.data.fileName}.
          </p>
        ) : null}
        {exporter.isError ? (
          <p role="alert" className="text-sm font-semibold text-clay-deep">
            <span aria-hidden="true">⚠ </span>
            The export failed: {describeError(exporter.error)}
          </p>
        ) : null}
      </div>
    </div>
  );
}
