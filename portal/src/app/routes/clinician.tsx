import type { QueryClient } from "@tanstack/react-query";
import type { LoaderFunctionArgs, RouteObject } from "react-router-dom";
import { useParams } from "react-router-dom";
import { afterGuard } from "./guards";

/**
 * The clinician's area under /clinician. Each screen is its own chunk (charts load with their
 * route). Loaders start every request in parallel before the screen renders.
 */
export function clinicianRoutes(queryClient: QueryClient): RouteObject[] {
  return [
    {
      index: true,
      lazy: async () => {
        const { CaseloadPage, caseloadQueryOptions } = await import("@/features/caseload");
        return {
          loader: afterGuard(queryClient, "clinician", async () => {
            await queryClient.ensureQueryData(caseloadQueryOptions());
          }),
          Component: CaseloadPage,
        };
      },
    },
    {
      path: "patients/:patientId",
      lazy: async () => {
        const [trends, notes, consent] = await Promise.all([import("@/features/patient-trends"), import("@/features/notes"), import("@/features/research-consent")]);
        return {
          loader: afterGuard(queryClient, "clinician", async ({ params }: LoaderFunctionArgs) => {
            const id = params.patientId!;
            await Promise.all([
              queryClient.ensureQueryData(trends.patientDetailQueryOptions(id)),
              queryClient.ensureQueryData(trends.trendsQueryOptions(id)),
              queryClient.ensureQueryData(trends.patientSessionsQueryOptions(id)),
              queryClient.ensureQueryData(notes.notesQueryOptions(id)),
              queryClient.ensureQueryData(notes.trainingQueryOptions(id)),
            ]);
          }),
          Component: function PatientRoute() {
            const id = useParams().patientId!;
            const { data: n } = notes.useNotes(id);
            const { data: t } = notes.useTraining(id);
            return (
              <trends.PatientTrendsPage
                patientId={id}
                markers={notes.notesToMarkers(n.items, t.items)}
                notesPanel={
                  <>
                    <notes.NotesPanel patientId={id} />
                    <consent.ConsentHistoryPanel patientId={id} role="clinician" />
                  </>
                }
              />
            );
          },
        };
      },
    },
    {
      path: "sessions/:sessionId",
      lazy: async () => {
        const [review, notes, trends] = await Promise.all([import("@/features/session-review"), import("@/features/notes"), import("@/features/patient-trends")]);
        return {
          loader: afterGuard(queryClient, "clinician", async ({ params }: LoaderFunctionArgs) => {
            await queryClient.ensureQueryData(review.sessionQueryOptions(params.sessionId!));
          }),
          Component: function SessionRoute() {
            const id = useParams().sessionId!;
            return (
              <review.SessionPage
                sessionId={id}
                // The walking aid shows on the patient's trends too; refetch them with the new value.
                onWalkingAidSaved={(patientId) => void queryClient.invalidateQueries({ queryKey: trends.trendsKeys.patient(patientId) })}
                notePanel={(patientId) => (
                  <section className="card mb-8 p-4" aria-label="Write a note about this session">
                    <notes.NoteForm patientId={patientId} sessionId={id} />
                  </section>
                )}
              />
            );
          },
        };
      },
    },
  ];
}
