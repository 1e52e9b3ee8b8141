export { PatientProgress } from "./components/patient-progress";
export { prefetchMyWalks, myWalksQueryOptions, progressKeys } from "./api/get-my-walks";
export { progressWords } from "./components/progress-words";
