import type { QueryClient } from "@tanstack/react-query";
import type { RouteObject } from "react-router-dom";
import { ErrorState } from "@/components/ui";
import { meQueryOptions, useMe } from "@/features/auth/api/get-me";

/** The patient's area under /patient: this week's walk (home) and progress over the weeks. */
export function patientRoutes(queryClient: QueryClient): RouteObject[] {
  return [
    {
      index: true,
      lazy: async () => {
        const { WeeklyWalk } = await import("@/features/patient-walk");
        return { Component: WeeklyWalk };
      },
    },
    {
      path: "progress",
      lazy: async () => {
        const [m, team, consent] = await Promise.all([import("@/features/patient-progress"), import("@/features/care-team"), import("@/features/research-consent")]);
        return {
          loader: async () => {
            const me = await queryClient.ensureQueryData(meQueryOptions());
            void queryClient.prefetchQuery(team.careTeamQueryOptions());
            if (me?.patientId) void queryClient.prefetchQuery(consent.consentQueryOptions(me.patientId));
            if (me?.patientId) await m.prefetchMyWalks(queryClient, me.patientId);
            return null;
          },
          Component: function ProgressRoute() {
            const { data: me } = useMe();
            if (!me?.patientId) return <ErrorState title="This account is not linked to a patient record" />;
            return (
              <>
                <m.PatientProgress patientId={me.patientId} />
                <team.CareTeamPanel />
                <consent.PatientConsentPanel patientId={me.patientId} />
              </>
            );
          },
        };
      },
    },
  ];
}
