// The upload answer and the session the status poll reads are the server's contracts
// (`uploadResponse`, `sessionDetail`); the patient screens read only the status fields.
export type { UploadResponse } from "@pendula/ingest-server/contracts";

export const walkKeys = {
  all: ["patient-walk"] as const,
  sessions: () => [...walkKeys.all, "session"] as const,
  session: (id: string) => [...walkKeys.sessions(), id] as const,
};
