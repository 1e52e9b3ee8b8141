import { IconSteady, IconTrendDown, IconTrendUp } from "@/components/icons";
import { Badge } from "@/components/ui";

export const FLAG_WORDS: Record<string, string> = {
  improved: "Improved beyond MDC",
  worsened: "Worsened beyond MDC",
  "within-error": "Within measurement error",
};

/** Text + icon + colour; the icon shows the clinical direction, not the numeric one. */
export function FlagBadge({ flag, prefix }: { flag: string; prefix?: string }) {
  const words = FLAG_WORDS[flag] ?? flag;
  const label = prefix ? `${prefix}: ${words.charAt(0).toLowerCase()}${words.slice(1)}` : words;
  if (flag === "improved") return <Badge tone="good" icon={<IconTrendUp />}>{label}</Badge>;
  if (flag === "worsened") return <Badge tone="alert" icon={<IconTrendDown />}>{label}</Badge>;
  return <Badge tone="neutral" icon={<IconSteady />}>{label}</Badge>;
}

export const DEFAULT_CAUTIONS = [
  "A flag is a prompt to look at the recording and the patient, not a diagnosis.",
  "MDC95 (minimal detectable change, 95 % confidence) is the smallest change between two tests that exceeds measurement error. A smaller change may be noise; a larger one is probably real but not necessarily clinically important.",
  "Follow your local protocols and clinical judgement; Pendula supports decisions and does not make them.",
];

/** The short form printed beside every flag; the full cautions sit once above the charts. */
export const SHORT_CAUTION = [
  "A flag is a prompt to look, not a diagnosis. MDC95 = the smallest change beyond measurement error (95 % confidence); it says a change is probably real, not that it matters clinically. Follow local protocols.",
];
