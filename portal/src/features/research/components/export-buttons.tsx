import { Button } from "@/components/ui";
import { describeError } from "@/lib/api-error";
import type { CohortDefinition } from "../api/cohort-definition";
import { useCohortExport, type ExportFormat } from "../api/download-cohort-export";

const FORMATS: Array<{ format: ExportFormat; label: string; hint: string }> = [
  { format: "csv", label: "Download CSV", hint: "One row per session, one column per metric and the count behind it." },
  { format: "fhir", label: "Download FHIR bundle", hint: "One FHIR R4 Bundle: an Observation per session, UCUM units." },
];

export function ExportButtons({ definition, projectId }: { definition: CohortDefinition | null; projectId: string | null }) {
  const exporter = useCohortExport();
  const disabled = definition === null || projectId === null || exporter.isPending;
  return (
    <div className="grid gap-3">
      <div className="flex flex-wrap gap-3">
        {FORMATS.map(({ format, label, hint }) => (
          <div key={format} className="grid max-w-xs gap-1">
            <Button
              variant="secondary"
              disabled={disabled}
              busy={exporter.isPending && exporter.variables?.format === format}
              onClick={() => definition && projectId && exporter.mutate({ definition, format, projectId })}
            >
              {label}
            </Button>
            <span className="text-xs text-ink-soft">{hint}</span>
          </div>
        ))}
      </div>
      {projectId === null ? <p className="text-sm text-ink-soft">Choose a research project first; its subject codes name the rows.</p> : null}
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
