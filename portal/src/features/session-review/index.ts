export { SessionPage } from "./components/session-page";
export { SignalChart } from "./components/signal-chart";
export { sessionQueryOptions, signalQueryOptions, sessionKeys } from "./api/session";
