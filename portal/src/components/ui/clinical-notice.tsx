import { IconInfo } from "@/components/icons";

export const CLINICAL_NOTICE =
  "Pendula supports clinical judgement. It does not diagnose, and it does not detect or respond to falls. In an emergency, call your local emergency number.";

export function ClinicalNotice() {
  return (
    <p className="flex items-start gap-2 text-sm text-ink-soft">
      <IconInfo className="mt-0.5 shrink-0" />
      <span>{CLINICAL_NOTICE}</span>
    </p>
  );
}
