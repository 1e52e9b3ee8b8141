import { EmptyState, PageHeader } from "@/components/ui";
import { useCaseload } from "../api/get-caseload";
import { CaseloadTable } from "./caseload-table";

export function CaseloadPage() {
  const { data } = useCaseload();
  return (
    <div>
      <PageHeader eyebrow="Clinician" title="Your caseload">
        Weekly home walks of the patients in your care. Open a patient to see their trends, flags and sessions.
      </PageHeader>
      {data.items.length === 0 ? (
        <EmptyState title="No patients in your caseload">Patients appear here once an administrator or a colleague adds them to your caseload.</EmptyState>
      ) : (
        <CaseloadTable rows={data.items} />
      )}
    </div>
  );
}
