import { queryOptions, useQuery, useSuspenseQuery } from "@tanstack/react-query";
import { z } from "zod";
import type { Analysis } from "@pendula/signal";
import { api } from "@/lib/api-client";

// ingest-server/src/contracts/sessions.ts (`sessionDetail`, `signalResponse`), copied because the
// contracts index does not re-export them yet. The analysis is signal's own `Analysis` object.
export const sessionDetailSchema = z.object({
  id: z.string(),
  patientId: z.string(),
  status: z.enum(["queued", "processing", "done", "failed"]),
  progressPct: z.number().optional(),
  recordedAt: z.string(),
  uploadedAt: z.string().optional(),
  durationS: z.number().nullish(),
  algorithmVersion: z.string().nullish(),
  error: z.string().nullish(),
  files: z.array(z.object({ placement: z.string(), deviceSerial: z.string().optional(), originalName: z.string().optional() })).optional(),
  analysis: z.custom<Analysis>((v) => typeof v === "object" && v !== null && "metrics" in v && "events" in v).optional(),
});
export type SessionDetail = z.infer<typeof sessionDetailSchema>;

export const signalSchema = z.object({
  sessionId: z.string(),
  unit: z.string(),
  fromS: z.number(),
  toS: z.number(),
  traces: z.array(
    z.object({
      placement: z.string(),
      sampleRateHz: z.number(),
      decimated: z.boolean().optional(),
      timeS: z.array(z.number()),
      value: z.array(z.number()),
    }),
  ),
});
export type SignalTraces = z.infer<typeof signalSchema>;

export const sessionKeys = {
  all: ["session-review"] as const,
  detail: (id: string) => [...sessionKeys.all, id] as const,
  signal: (id: string, placement: string) => [...sessionKeys.detail(id), "signal", placement] as const,
};

const enc = encodeURIComponent;

export const sessionQueryOptions = (id: string) =>
  queryOptions({ queryKey: sessionKeys.detail(id), queryFn: ({ signal }) => api.get(`/sessions/${enc(id)}`, { schema: sessionDetailSchema, signal }) });

export const signalQueryOptions = (id: string, placement: string) =>
  queryOptions({
    queryKey: sessionKeys.signal(id, placement),
    queryFn: ({ signal }) => api.get(`/sessions/${enc(id)}/signal`, { schema: signalSchema, query: { placement, maxPoints: 6000 }, signal }),
    staleTime: Infinity,
  });

export const useSession = (id: string) => useSuspenseQuery(sessionQueryOptions(id));
export const useSignal = (id: string, placement: string, enabled: boolean) => useQuery({ ...signalQueryOptions(id, placement), enabled });
