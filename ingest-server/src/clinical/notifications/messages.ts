/**
 * E-mail texts. Rule: no clinical value, metric name, diagnosis or patient name in any subject or
 * body — e-mail leaves our systems and may be read on a shared screen. A message says only that
 * something is waiting and links to the portal page, where access is checked.
 */
export interface ComposedMail {
  subject: string;
  text: string;
}

const FOOTER =
  "Pendula supports clinical decisions; it does not diagnose. Follow your local protocols and clinical judgement.";

export function patientPageUrl(publicUrl: string, patientId: string): string {
  return `${publicUrl.replace(/\/+$/, "")}/clinician/patients/${encodeURIComponent(patientId)}`;
}

export function reminderMail(publicUrl: string): ComposedMail {
  return {
    subject: "Pendula: your walking test for this week",
    text: [
      "Hello,",
      "",
      "We have not yet received this week's home walking test. When you are ready, and only if it is safe for you today, please record it and upload it in Pendula:",
      `${publicUrl.replace(/\/+$/, "")}/`,
      "",
      "Walk only on a clear, level, well-lit path with a phone within reach, and stop if you feel unwell or unsteady. If in doubt, ask your care team first.",
      "",
      "This is an automatic message.",
    ].join("\n"),
  };
}

export function changeAlertMail(publicUrl: string, patientId: string): ComposedMail {
  return {
    subject: "Pendula: a new walking-test result to review",
    text: [
      "A new walking-test session for one of your patients has a result that Pendula suggests reviewing.",
      "",
      `Open it here (sign-in required): ${patientPageUrl(publicUrl, patientId)}`,
      "",
      "A flag is a prompt to look at the recording and the patient, not a diagnosis.",
      FOOTER,
    ].join("\n"),
  };
}

export interface DigestCounts {
  isoWeek: string;
  patients: number;
  sessions: number;
  sessionsToReview: number;
  patientsBehind: number;
}

export function digestMail(publicUrl: string, c: DigestCounts): ComposedMail {
  return {
    subject: `Pendula: weekly summary ${c.isoWeek}`,
    text: [
      `Your caseload in ISO week ${c.isoWeek}:`,
      "",
      `- patients: ${c.patients}`,
      `- walking-test sessions recorded: ${c.sessions}`,
      `- sessions suggested for review: ${c.sessionsToReview}`,
      `- patients with fewer uploads than expected: ${c.patientsBehind}`,
      "",
      `Details in Pendula (sign-in required): ${publicUrl.replace(/\/+$/, "")}/clinician`,
      "",
      FOOTER,
    ].join("\n"),
  };
}
