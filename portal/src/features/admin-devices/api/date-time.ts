import { z } from "zod";

/**
 * A `<input type="datetime-local">` value ("2026-11-30T09:15") in the admin's own time zone, sent to
 * the server as an ISO instant. Assignment boundaries are instants: the server compares them with
 * each recording's start time to decide which device was on which limb.
 */
export const localDateTime = (what: string) =>
  z
    .string()
    .min(1, { error: `enter the ${what} date and time` })
    .refine((v) => !Number.isNaN(new Date(v).getTime()), { error: `the ${what} date and time is not valid` })
    .transform((v) => new Date(v).toISOString());

export function toLocalInputValue(date: Date): string {
  const pad = (n: number) => String(n).padStart(2, "0");
  return `${date.getFullYear()}-${pad(date.getMonth() + 1)}-${pad(date.getDate())}T${pad(date.getHours())}:${pad(date.getMinutes())}`;
}

export function formatInstant(iso: string): string {
  const d = new Date(iso);
  return Number.isNaN(d.getTime())
    ? iso
    : d.toLocaleString("en-GB", { year: "numeric", month: "short", day: "numeric", hour: "2-digit", minute: "2-digit" });
}

export function formatDay(iso: string): string {
  const d = new Date(iso);
  return Number.isNaN(d.getTime()) ? iso : d.toLocaleDateString("en-GB", { year: "numeric", month: "short", day: "numeric" });
}
