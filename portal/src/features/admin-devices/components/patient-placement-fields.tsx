import { SelectField } from "@/components/ui";
import { useAssignablePatients } from "../api/assignable-patients";
import { PLACEMENT_OPTIONS } from "@/lib/placement-labels";

interface Props {
  patientId: string;
  placement: string;
  onPatient: (id: string) => void;
  onPlacement: (placement: string) => void;
  errors: { patientId?: string; placement?: string };
}

export function PatientPlacementFields({ patientId, placement, onPatient, onPlacement, errors }: Props) {
  const patients = useAssignablePatients();
  return (
    <>
      <SelectField
        label="Patient"
        value={patientId}
        onChange={(e) => onPatient(e.target.value)}
        error={patients.isError ? "The patient list could not be loaded." : errors.patientId}
        disabled={patients.isPending}
        hint={patients.isPending ? "Loading patients…" : undefined}
      >
        <option value="">Choose a patient</option>
        {(patients.data ?? []).map((p) => (
          <option key={p.id} value={p.id}>
            {p.label}
          </option>
        ))}
      </SelectField>
      <SelectField label="Placement" value={placement} onChange={(e) => onPlacement(e.target.value)} error={errors.placement}>
        <option value="">Choose a placement</option>
        {PLACEMENT_OPTIONS.map((p) => (
          <option key={p.value} value={p.value}>
            {p.label}
          </option>
        ))}
      </SelectField>
    </>
  );
}
