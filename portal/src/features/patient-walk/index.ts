export { WeeklyWalk } from "./components/weekly-walk";
export { walkKeys } from "./api/walk-keys";
