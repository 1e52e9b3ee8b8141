import { useId, useState, type FormEvent } from "react";
import { Button, ErrorState, FormMessage, LoadingState, SelectField, TextAreaField, TextField } from "@/components/ui";
import { describeError } from "@/lib/api-error";
import { newProjectSchema, useCreateResearchProject, useResearchProjects } from "../api/research-projects";

interface Props {
  projectId: string | null;
  onChange: (projectId: string | null) => void;
}

function NewProjectForm({ onCreated }: { onCreated: (id: string) => void }) {
  const create = useCreateResearchProject();
  const [name, setName] = useState("");
  const [purpose, setPurpose] = useState("");
  const [error, setError] = useState<string | null>(null);

  function submit(event: FormEvent) {
    event.preventDefault();
    const parsed = newProjectSchema.safeParse({ name, ...(purpose.trim() ? { purpose } : {}) });
    if (!parsed.success) {
      setError(parsed.error.issues[0]?.message ?? "check the project name");
      return;
    }
    setError(null);
    create.mutate(parsed.data, {
      onSuccess: (project) => {
        setName("");
        setPurpose("");
        onCreated(project.id);
      },
    });
  }

  return (
    <form onSubmit={submit} noValidate className="grid gap-3 rounded-lg border border-line bg-sand p-4" aria-label="New research project">
      <TextField label="Project name" value={name} onChange={(e) => setName(e.target.value)} error={error ?? undefined} maxLength={120} required />
      <TextAreaField
        label="Purpose (optional)"
        hint="What the data will be used for; shown to admins who review research projects."
        value={purpose}
        onChange={(e) => setPurpose(e.target.value)}
        maxLength={1000}
      />
      <div>
        <Button type="submit" busy={create.isPending}>
          Create project
        </Button>
      </div>
      {create.isError ? <FormMessage tone="error">{describeError(create.error)}</FormMessage> : null}
    </form>
  );
}

/** The researcher's own projects; each has its own subject codes, so exports of two projects cannot be joined. */
export function ProjectPicker({ projectId, onChange }: Props) {
  const projects = useResearchProjects();
  const [adding, setAdding] = useState(false);
  const hintId = useId();
  if (projects.isPending) return <LoadingState label="Loading your research projects…" />;
  if (projects.isError) return <ErrorState title="Your research projects could not be loaded" error={projects.error} onRetry={() => void projects.refetch()} />;
  const list = projects.data;
  const chosen = list.find((p) => p.id === projectId) ?? null;
  return (
    <div className="grid gap-4">
      <p id={hintId} className="text-sm text-ink-soft">
        Every project has its own subject codes: the same person is coded differently in each project, and stays the same
        within one project from export to export. Use one project per study or protocol.
      </p>
      {list.length > 0 ? (
        <SelectField
          label="Export under project"
          aria-describedby={hintId}
          value={chosen?.id ?? ""}
          onChange={(e) => onChange(e.target.value || null)}
        >
          <option value="">Choose a project…</option>
          {list.map((p) => (
            <option key={p.id} value={p.id}>
              {p.name}
            </option>
          ))}
        </SelectField>
      ) : (
        <p className="text-sm font-semibold text-ink">You have no research project yet. Create one to export.</p>
      )}
      {chosen?.purpose ? <p className="text-sm text-ink-soft">Purpose: {chosen.purpose}</p> : null}
      {adding || list.length === 0 ? (
        <NewProjectForm
          onCreated={(id) => {
            setAdding(false);
            onChange(id);
          }}
        />
      ) : (
        <div>
          <Button variant="secondary" onClick={() => setAdding(true)}>
            New project
          </Button>
        </div>
      )}
    </div>
  );
}
