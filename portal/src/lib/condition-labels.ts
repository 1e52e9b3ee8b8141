import { CONDITIONS, type Condition } from "@pendula/ingest-server/contracts";

/**
 * The diagnosis group a patient was enrolled under (server enum in db/src/enums.ts). Records over
 * the enumeration, so a new condition fails the type check until it has its words here.
 */
export const CONDITION_LABEL: Record<Condition, string> = {
  incomplete_sci: "Incomplete spinal cord injury",
  stroke: "Stroke",
  parkinsons: "Parkinson's disease",
  other: "Other condition",
};

/**
 * Compact words for table columns and their filters, where the full name would wrap every row.
 * SCI is the field's usual abbreviation of spinal cord injury.
 */
export const CONDITION_SHORT_LABEL: Record<Condition, string> = {
  incomplete_sci: "Incomplete SCI",
  stroke: "Stroke",
  parkinsons: "Parkinson's",
  other: "Other",
};

/** Every condition in the server's order, with its full words (selects and check lists). */
export const CONDITION_OPTIONS: readonly { value: Condition; label: string }[] = CONDITIONS.map((value) => ({ value, label: CONDITION_LABEL[value] }));

const isCondition = (value: string): value is Condition => Object.hasOwn(CONDITION_LABEL, value);

/** Words for a condition; missing reads "—", a value this build does not know is shown as it came. */
export function conditionLabel(value: string | null | undefined, { short = false }: { short?: boolean } = {}): string {
  if (!value) return "—";
  if (!isCondition(value)) return value;
  return short ? CONDITION_SHORT_LABEL[value] : CONDITION_LABEL[value];
}
