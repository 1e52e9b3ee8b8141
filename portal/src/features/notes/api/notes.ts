import { queryOptions, useMutation, useQueryClient, useSuspenseQuery } from "@tanstack/react-query";
import { z } from "zod";
import { createNote, note, noteList, trainingList } from "@pendula/ingest-server/contracts";
import { api } from "@/lib/api-client";

export type Note = z.infer<typeof note>;
export type TrainingEntry = z.infer<typeof trainingList>["items"][number];

/** The note form: the server's `createNote` request with the words this form shows. */
export const createNoteInput = createNote.extend({
  body: z.string().trim().min(1, "Write something before saving.").max(10_000, "Notes are limited to 10 000 characters."),
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
    queryFn: ({ signal }) => api.get(`/patients/${enc(patientId)}/notes`, { schema: noteList, signal }),
  });

export const trainingQueryOptions = (patientId: string) =>
  queryOptions({
    queryKey: notesKeys.training(patientId),
    queryFn: ({ signal }) => api.get(`/patients/${enc(patientId)}/training`, { schema: trainingList, signal }),
  });

export const useNotes = (patientId: string) => useSuspenseQuery(notesQueryOptions(patientId));
export const useTraining = (patientId: string) => useSuspenseQuery(trainingQueryOptions(patientId));

export function useCreateNote(patientId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: z.infer<typeof createNoteInput>) => api.post(`/patients/${enc(patientId)}/notes`, input, { schema: note }),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: notesKeys.notes(patientId) }),
  });
}
