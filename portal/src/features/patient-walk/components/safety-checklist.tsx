import { useId, useState } from "react";
import { IconAlert, IconStop } from "@/components/icons";
import { Button, FormMessage } from "@/components/ui";

// Preparation and stop rules for an unsupervised walk at home. Sources: the ATS 2002 six-minute
// walk statement (stop reasons) and common practice for home testing
// (docs/methods.md#safety-cautions-for-home-walking-tests).
export const PREPARATION_ITEMS = [
  { id: "path", text: "My walking path is clear, level and well lit, with no rugs, cables or pets in the way, and a chair to rest on at each end." },
  { id: "shoes", text: "I am wearing my usual shoes, and using my usual walking aid and any braces or splints." },
  { id: "company", text: "Someone is nearby, if my clinician advised it." },
  { id: "phone", text: "My phone is within reach." },
  { id: "sensors", text: "The four sensors are on both lower legs and both wrists, the way my care team showed me." },
] as const;

export const STOP_RULES = [
  "chest pain or tightness",
  "severe breathlessness",
  "feeling dizzy, faint, sweaty or unusually pale",
  "staggering or losing your balance",
  "leg cramps",
  "new or worsening pain",
  "a freezing episode (feet feel stuck) that does not pass",
] as const;

export function SafetyChecklist({ onAcknowledged }: { onAcknowledged: () => void }) {
  const [ticked, setTicked] = useState<Record<string, boolean>>({});
  const [stopAck, setStopAck] = useState(false);
  const [showMissing, setShowMissing] = useState(false);
  const base = useId();
  const missing = PREPARATION_ITEMS.filter((i) => !ticked[i.id]).length + (stopAck ? 0 : 1);

  return (
    <div className="flex flex-col gap-6">
      <fieldset className="card p-5 sm:p-6">
        <legend className="sr-only">Before you start</legend>
        <h2 className="text-lg font-bold">1. Before you start</h2>
        <p className="mb-4 text-ink-soft">Tick each one when it is true.</p>
        <ul className="flex flex-col gap-3">
          {PREPARATION_ITEMS.map((item) => (
            <li key={item.id}>
              <label htmlFor={`${base}-${item.id}`} className="flex cursor-pointer items-start gap-3 rounded-lg p-1.5 hover:bg-sand">
                <input
                  id={`${base}-${item.id}`}
                  type="checkbox"
                  className="mt-1 size-5 shrink-0 accent-moss"
                  checked={Boolean(ticked[item.id])}
                  onChange={(e) => setTicked((t) => ({ ...t, [item.id]: e.target.checked }))}
                />
                <span>{item.text}</span>
              </label>
            </li>
          ))}
        </ul>
      </fieldset>

      <section aria-labelledby={`${base}-stop`} className="card border-clay/50 p-5 sm:p-6">
        <h2 id={`${base}-stop`} className="flex items-center gap-2 text-lg font-bold text-clay-deep">
          <IconStop /> 2. Stop walking and sit down if you have
        </h2>
        <ul className="mt-3 grid list-disc gap-1 pl-6 sm:grid-cols-2">
          {STOP_RULES.map((rule) => (
            <li key={rule}>{rule}</li>
          ))}
        </ul>
        <p className="mt-4 flex items-start gap-2 rounded-lg bg-clay-wash p-3 font-semibold text-clay-deep">
          <IconAlert className="mt-0.5 shrink-0" />
          <span>
            Pendula does not notice falls and cannot call for help. If you fall or feel unwell, call the person with you or your local emergency
            number, as your care team advised. Tell your care team about any fall.
          </span>
        </p>
        <label htmlFor={`${base}-stopack`} className="mt-4 flex cursor-pointer items-start gap-3 rounded-lg p-1.5 hover:bg-sand">
          <input
            id={`${base}-stopack`}
            type="checkbox"
            className="mt-1 size-5 shrink-0 accent-moss"
            checked={stopAck}
            onChange={(e) => setStopAck(e.target.checked)}
          />
          <span className="font-semibold">I will stop if any of these happen, and I know Pendula does not detect falls.</span>
        </label>
      </section>

      <div className="flex flex-col items-start gap-3">
        {showMissing && missing > 0 ? (
          <FormMessage tone="error">
            {missing === 1 ? "One item is not ticked yet." : `${missing} items are not ticked yet.`} Please check each one before you walk.
          </FormMessage>
        ) : null}
        <Button
          size="lg"
          onClick={() => {
            if (missing > 0) setShowMissing(true);
            else onAcknowledged();
          }}
        >
          I'm ready: add my sensor files
        </Button>
      </div>
    </div>
  );
}
