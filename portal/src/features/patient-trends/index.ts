export { PatientTrendsPage } from "./components/patient-trends-page";
export { patientDetailQueryOptions, trendsQueryOptions, patientSessionsQueryOptions, trendsKeys } from "./api/trends";
