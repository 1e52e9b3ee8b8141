import { useState } from "react";
import { PageHeader } from "@/components/ui";
import { DEFAULT_COHORT, type CohortDefinition } from "../api/cohort-definition";
import { AnonymisationNotice } from "./anonymisation-notice";
import { CohortBuilderForm } from "./cohort-builder-form";
import { CohortPreviewPanel } from "./cohort-preview-table";
import { ExportButtons } from "./export-buttons";
import { ExportPrecisionTable } from "./export-precision-table";
import { ProjectPicker } from "./project-picker";

export function ResearchPage() {
  const [definition, setDefinition] = useState<CohortDefinition | null>(null);
  const [projectId, setProjectId] = useState<string | null>(null);
  return (
    <div className="grid gap-6">
      <PageHeader eyebrow="Research" title="Cohort builder">
        Define a cohort of consenting subjects, check the group sizes, then export anonymised gait and coordination
        metrics.
      </PageHeader>
      <AnonymisationNotice />
      <section aria-labelledby="project-heading" className="card p-5">
        <h2 id="project-heading" className="mb-4 text-lg font-bold text-ink">
          1. Research project
        </h2>
        <ProjectPicker projectId={projectId} onChange={setProjectId} />
      </section>
      <section aria-labelledby="definition-heading" className="card p-5">
        <h2 id="definition-heading" className="mb-4 text-lg font-bold text-ink">
          2. Define the cohort
        </h2>
        <CohortBuilderForm initial={definition ?? DEFAULT_COHORT} onSubmit={setDefinition} />
      </section>
      <section aria-labelledby="preview-heading" className="card p-5">
        <h2 id="preview-heading" className="mb-4 text-lg font-bold text-ink">
          3. Preview group sizes
        </h2>
        <CohortPreviewPanel definition={definition} />
      </section>
      <section aria-labelledby="export-heading" className="card p-5">
        <h2 id="export-heading" className="mb-4 text-lg font-bold text-ink">
          4. Export
        </h2>
        <div className="grid gap-4">
          <ExportButtons definition={definition} projectId={projectId} />
          <ExportPrecisionTable />
        </div>
      </section>
    </div>
  );
}
