export { CaseloadPage } from "./components/caseload-page";
export { caseloadQueryOptions, caseloadKeys } from "./api/get-caseload";
