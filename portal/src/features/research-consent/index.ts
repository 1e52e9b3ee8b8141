export { PatientConsentPanel } from "./components/patient-consent-panel";
export { ConsentHistoryPanel } from "./components/consent-history-panel";
export { consentKeys, consentQueryOptions, useConsent } from "./api/consent";
