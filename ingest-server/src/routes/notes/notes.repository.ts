import type { Knex } from "knex";

export interface NoteRow {
  id: string;
  patient_id: string;
  session_id: string | null;
  author_id: string;
  author_name: string;
  body: string;
  created_at: Date;
}

function selectNotes(db: Knex) {
  return db("clinician_notes as n")
    .join("users as u", "u.id", "n.author_id")
    .select("n.id", "n.patient_id", "n.session_id", "n.author_id", "u.display_name as author_name", "n.body", "n.created_at");
}

/** A patient's notes, newest first (at most 500). */
export function listNotes(db: Knex, patientId: string): Promise<NoteRow[]> {
  return selectNotes(db).where("n.patient_id", patientId).orderBy("n.created_at", "desc").limit(500);
}

export async function findNote(db: Knex, id: string): Promise<NoteRow | undefined> {
  const [row] = (await selectNotes(db).where("n.id", id)) as NoteRow[];
  return row;
}

/** True when `sessionId` is a session of `patientId`. */
export async function isSessionOfPatient(db: Knex, sessionId: string, patientId: string): Promise<boolean> {
  return (await db("walk_sessions").where({ id: sessionId, patient_id: patientId }).first("id")) !== undefined;
}

export async function insertNote(db: Knex, note: { patient_id: string; session_id: string | null; author_id: string; body: string }): Promise<string> {
  const [row] = await db("clinician_notes").insert(note).returning("id");
  return row.id as string;
}
