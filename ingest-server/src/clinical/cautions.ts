/** Cautions shown beside every flag and event; the portal imports these so the wording is one text. */
export const CAUTION_MDC =
  "MDC95 is the smallest change that exceeds measurement error with 95 % confidence for a change between two tests. A change inside it may be noise; a change beyond it is probably real but not necessarily clinically important.";
export const CAUTION_PATIENT_BASELINE =
  "Where no published reliability value fits this patient's condition, the MDC comes from the patient's own first sessions; with only a few sessions it is a rough estimate.";
export const CAUTION_PROMPT_NOT_DIAGNOSIS =
  "A flag or event is a prompt to look at the recording and the patient, not a diagnosis.";
export const CAUTION_LOCAL_PROTOCOL =
  "Follow your local protocols and clinical judgement; Pendula supports decisions and does not make them.";
export const CAUTION_BANDS =
  "Reference bands describe only the cohorts of the cited studies (age, condition, walking condition and measurement system are given with each band); they are shown only to patients those cohorts describe. Published values come from walkways, timed walk tests or other sensors, not from this home test. Walking speed changes stride variability and PCI, so read them beside speed.";

export const CLINICAL_CAUTIONS: readonly string[] = [
  CAUTION_MDC,
  CAUTION_PATIENT_BASELINE,
  CAUTION_PROMPT_NOT_DIAGNOSIS,
  CAUTION_LOCAL_PROTOCOL,
  CAUTION_BANDS,
];
