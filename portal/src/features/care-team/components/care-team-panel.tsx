import { ErrorState, LoadingState, Section } from "@/components/ui";
import { formatLongDate } from "@/lib/format";
import { useMyCareTeam, type CareTeamMember } from "../api/care-team";


/** Who can read the patient's walks, in plain words, with what other roles can and cannot see. */
export function CareTeamPanel() {
  const team = useMyCareTeam();
  const current: CareTeamMember[] = team.data?.filter((m) => m.active) ?? [];
  const former: CareTeamMember[] = team.data?.filter((m) => !m.active) ?? [];

  return (
    <Section title="Who can see your walks" id="care-team">
      {team.isPending ? (
        <LoadingState label="Loading your care team…" />
      ) : team.isError ? (
        <ErrorState title="Your care team could not be loaded" error={team.error} onRetry={() => void team.refetch()} />
      ) : (
        <div className="card flex flex-col gap-3 p-5 text-[1.05rem]">
          {current.length === 0 ? (
            <p>No clinician can see your walks at the moment.</p>
          ) : (
            <>
              <p>
                {current.length === 1 ? "This member of your care team can" : "These members of your care team can"} see your weekly walks, their
                measurements and the notes kept about your training:
              </p>
              <ul className="list-disc pl-6">
                {current.map((m) => (
                  <li key={`${m.clinicianName}-${m.since}`}>
                    {m.clinicianName}, since {formatLongDate(m.since)}
                  </li>
                ))}
              </ul>
            </>
          )}
          {former.length > 0 ? (
            <>
              <p className="text-ink-soft">No longer able to see them:</p>
              <ul className="list-disc pl-6 text-ink-soft">
                {former.map((m) => (
                  <li key={`${m.clinicianName}-${m.since}`}>
                    {m.clinicianName}, from {formatLongDate(m.since)} to {formatLongDate(m.until!)}
                  </li>
                ))}
              </ul>
            </>
          ) : null}
          <p className="text-ink-soft">
            The service&apos;s administrators can see your name and account details, not your walks. Researchers never see your name.
          </p>
          <p className="text-ink-soft">Your service decides who is on your care team. If anything here looks wrong, tell your care team.</p>
        </div>
      )}
    </Section>
  );
}
