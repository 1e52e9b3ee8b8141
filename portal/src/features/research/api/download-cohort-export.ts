import { useMutation } from "@tanstack/react-query";
import { request } from "@/lib/api-client";
import type { CohortDefinition } from "./cohort-definition";

export type ExportFormat = "csv" | "fhir";

const EXTENSION: Record<ExportFormat, string> = { csv: "csv", fhir: "fhir.json" };

/** The definition travels as query parameters so the export is a plain, repeatable GET. */
export function exportQuery(definition: CohortDefinition, format: ExportFormat, projectId: string): Record<string, string> {
  return {
    projectId,
    format,
    conditions: definition.conditions.join(","),
    ageBands: definition.ageBands.join(","),
    weeksFrom: String(definition.weeksSinceEnrolment.from),
    weeksTo: String(definition.weeksSinceEnrolment.to),
    metrics: definition.metrics.join(","),
  };
}

export interface CohortExportFile {
  blob: Blob;
  fileName: string;
}

function fileNameFrom(res: Response, format: ExportFormat): string {
  const disposition = res.headers.get("content-disposition") ?? "";
  const match = /filename="?([^";]+)"?/i.exec(disposition);
  return match?.[1] ?? `pendula-cohort.${EXTENSION[format]}`;
}

export async function fetchCohortExport(definition: CohortDefinition, format: ExportFormat, projectId: string): Promise<CohortExportFile> {
  const res = await request<Response>("/research/cohort-metrics", { query: exportQuery(definition, format, projectId), raw: true });
  return { blob: await res.blob(), fileName: fileNameFrom(res, format) };
}

/** Hands a fetched file to the browser's download manager (the export needs the bearer token, so a plain link cannot). */
export function saveFile({ blob, fileName }: CohortExportFile): void {
  const url = URL.createObjectURL(blob);
  const a = document.createElement("a");
  a.href = url;
  a.download = fileName;
  a.rel = "noopener";
  document.body.append(a);
  a.click();
  a.remove();
  // Revoke on the next turn: revoking synchronously can cancel the download in some browsers.
  setTimeout(() => URL.revokeObjectURL(url), 0);
}

export function cohortExportMutationOptions() {
  return {
    mutationKey: ["research", "export"] as const,
    mutationFn: async ({ definition, format, projectId }: { definition: CohortDefinition; format: ExportFormat; projectId: string }) => {
      const file = await fetchCohortExport(definition, format, projectId);
      saveFile(file);
      return file;
    },
  };
}

export function useCohortExport() {
  return useMutation(cohortExportMutationOptions());
}
