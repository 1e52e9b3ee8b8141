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
