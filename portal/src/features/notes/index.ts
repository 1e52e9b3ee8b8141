export { NotesPanel, NoteForm, notesToMarkers } from "./components/notes-panel";
export { notesQueryOptions, trainingQueryOptions, useNotes, useTraining, notesKeys } from "./api/notes";
