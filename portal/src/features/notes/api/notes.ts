import { queryOptions, useMutation, useQueryClient, useSuspenseQuery } from "@tanstack/react-query";
import { z } from "zod";
import { api } from "@/lib/api-client";

// ingest-server/src/contracts/notes.ts and training.ts (copied until the contracts index exports them).
export const noteSchema = z.object({
  id: z.string(),
  patientId: z.string(),
  sessionId: z.string().nullish(),
  authorName: z.string().optional(),
  body: z.string(),
  createdAt: z.string(),
});
export type Note = z.infer<typeof noteSchema>;

export const trainingSchema = z.object({
  id: z.string(),
  performedOn: z.string(),
  kind: z.string(),
  minutes: z.number(),
  description: z.string().nullish(),
});
export type TrainingEntry = z.infer<typeof trainingSchema>;

export const createNoteInput = z.object({
  body: z.string().trim().min(1, "Write something before saving.").max(10_000, "Notes are limited to 10 000 characters."),
  sessionId: z.string().optional(),
});

export const notesKeys = {
  all: ["notes"] as const,
  patient: (patientId: string) => [...notesKeys.all, patientId] as const,
  notes: (patientId: string) => [...notesKeys.patient(patientId), "notes"] as const,
  training: (patientId: string) => [...notesKeys.patient(patientId), "training"] as const,
};

const enc = encodeURIComponent;

export const notesQueryOptions = (patientId: string) =>
  queryOptions({
    queryKey: notesKeys.notes(patientId),
    queryFn: ({ signal }) => api.get(`/patients/${enc(patientId)}/notes`, { schema: z.object({ items: z.array(noteSchema) }), signal }),
  });

export const trainingQueryOptions = (patientId: string) =>
  queryOptions({
    queryKey: notesKeys.training(patientId),
    queryFn: ({ signal }) => api.get(`/patients/${enc(patientId)}/training`, { schema: z.object({ items: z.array(trainingSchema) }), signal }),
  });

export const useNotes = (patientId: string) => useSuspenseQuery(notesQueryOptions(patientId));
export const useTraining = (patientId: string) => useSuspenseQuery(trainingQueryOptions(patientId));

export function useCreateNote(patientId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: z.infer<typeof createNoteInput>) => api.post(`/patients/${enc(patientId)}/notes`, input, { schema: noteSchema }),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: notesKeys.notes(patientId) }),
  });
}
