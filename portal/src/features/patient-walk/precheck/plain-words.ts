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
    default:
      return "Something in this recording may need a second look by your care team.";
  }
}
