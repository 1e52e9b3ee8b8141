import type { QualityItem } from "@pendula/signal";
import { placementWords } from "@/lib/placement-labels";

// Patient-facing wording for each quality code: what happened and what to try, without jargon and
// without alarm. The analysis' own message stays attached for the care team.

export function plainQuality(item: Pick<QualityItem, "code" | "placement">): string {
  const where = item.placement ? ` (${placementWords(item.placement)})` : "";
  switch (item.code) {
    case "gap":
      return `The sensor${where} lost contact for a moment. Short breaks are fine; Pendula leaves them out.`;
    case "invalid-span":
      return `Part of the recording${where} could not be used. The rest can still be measured.`;
    case "saturation":
      return `The sensor${where} reached the top of its range, as if it was knocked or loose. Check the strap is snug next time.`;
    case "inverted-sensor":
      return `The sensor${where} seems to have been worn upside down. Pendula corrected for it; next time check which way up it goes.`;
    case "rate-mismatch":
      return `The sensor${where} recorded at an unusual speed. It may need its battery charged or to be checked by your care team.`;
    case "few-strides":
      return "Fewer steps were found than are needed for the most reliable results. Only walk further if your care team has said it is safe for you.";
    case "missing-placement":
      return `A sensor${where} is missing or its position is unknown. Check that you added all the files from this walk.`;
    case "no-walking":
      return `No walking was found${where}. Check that you added the files from this week's walk and that the sensors were switched on.`;
    case "misalignment":
      return `The sensor${where} seems to have sat at an angle. Pendula allows for some of this.`;
    case "dfa-unavailable":
      return "One long-walk measure needs a much longer recording and is left out. That is normal.";
    case "event-order":
      return "Some steps could not be timed reliably and were left out.";
    case "strides-excluded":
      return "Some steps, such as turns, starts and stops, were left out of the measurements. That is normal.";
    case "clock-offset":
      return `The clock of the sensor${where} was slightly out of step with the others. Pendula lined them up; nothing for you to do.`;
    case "clock-unverified":
      return `Pendula could not check that the sensors' clocks${where} agree, so it used the times in the files. Nothing for you to do.`;
    case "speed-unavailable":
      return "Walking speed could not be worked out from this recording. Your other results are not affected.";
    case "arm-sign-unverified":
      return `Pendula could not tell which way the sensor${where} was worn, so your care team will check the arm measures. Next time, wear it as your instructions show.`;
    case "placement-swap":
      return `The sensors${where} may have been swapped between left and right. Your care team will check; next time, put each sensor on the side it is meant for.`;
    case "no-arm-swing":
      return `Little or no arm swing was found${where}, so the arm measures are left out. That is expected if you used a walking aid or carried something.`;
    default: {
      // Every code has its own words: a new code fails the type check here until it gets them.
      const unworded: never = item.code;
      return unworded;
    }
  }
}
