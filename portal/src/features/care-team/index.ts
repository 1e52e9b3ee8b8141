export { CareTeamPanel } from "./components/care-team-panel";
export { careTeamQueryOptions, careTeamKeys } from "./api/care-team";
