import type { Knex } from "knex";
import type { TRAINING_KINDS } from "../../contracts/enums";

export type TrainingKind = (typeof TRAINING_KINDS)[number];

export interface TrainingRow {
  id: string;
  patient_id: string;
  author_id: string;
  /** 'YYYY-MM-DD': DATE columns arrive as the stored day (db/src/connection.ts). */
  performed_on: string;
  kind: TrainingKind;
  minutes: number;
  description: string | null;
  created_at: Date;
}

/** A patient's training log, newest day first and, within a day, newest entry first (at most 1000). */
export function listTraining(db: Knex, patientId: string): Promise<TrainingRow[]> {
  return db<TrainingRow>("training_log")
    .where({ patient_id: patientId })
    .orderBy([{ column: "performed_on", order: "desc" }, { column: "created_at", order: "desc" }])
    .limit(1000);
}

export async function insertTraining(db: Knex, entry: Omit<TrainingRow, "id" | "created_at">): Promise<TrainingRow> {
  const [row] = await db("training_log").insert(entry).returning("*");
  return row as TrainingRow;
}
