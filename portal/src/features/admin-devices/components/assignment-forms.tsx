import { useState, type FormEvent } from "react";
import type { z } from "zod";
import { Button, SelectField, TextField } from "@/components/ui";
import { assignDeviceInputSchema, useAssignDevice } from "../api/assign-device";
import { localDateTimeInputValue } from "@/lib/calendar-day";
import { formatDateTime } from "@/lib/format";
import type { Assignment } from "../api/devices";
import { endAssignmentInputSchema, useEndAssignment } from "../api/end-assignment";
import { swapPlacementInputSchema, useSwapPlacement } from "../api/swap-placement";
import { PLACEMENT_OPTIONS, placementLabel } from "@/lib/placement-labels";
import { AssignmentError } from "./assignment-error";
import { PatientPlacementFields } from "./patient-placement-fields";

type Errors = Record<string, string | undefined>;

function issuesToErrors(error: z.ZodError): Errors {
  const out: Errors = {};
  for (const issue of error.issues) out[String(issue.path[0])] ??= issue.message;
  return out;
}

const nowInput = () => localDateTimeInputValue(new Date());

export function AssignDeviceForm({ deviceId, serial, onDone }: { deviceId: string; serial: string; onDone?: (message: string) => void }) {
  const assign = useAssignDevice(deviceId, (a) =>
    onDone?.(`${serial} is now on the ${placementLabel(a.placement).toLowerCase()} from ${formatDateTime(a.from)}.`),
  );
  const [patientId, setPatientId] = useState("");
  const [placement, setPlacement] = useState("");
  const [from, setFrom] = useState(nowInput);
  const [errors, setErrors] = useState<Errors>({});

  function submit(event: FormEvent) {
    event.preventDefault();
    const parsed = assignDeviceInputSchema.safeParse({ patientId, placement, from });
    if (!parsed.success) return setErrors(issuesToErrors(parsed.error));
    setErrors({});
    assign.mutate(parsed.data);
  }

  return (
    <form onSubmit={submit} noValidate aria-labelledby="assign-heading" className="card grid gap-4 p-5">
      <h3 id="assign-heading" className="text-lg font-bold text-ink">
        Assign {serial}
      </h3>
      <div className="grid gap-4 md:grid-cols-3">
        <PatientPlacementFields
          patientId={patientId}
          placement={placement}
          onPatient={setPatientId}
          onPlacement={setPlacement}
          errors={errors}
        />
        <TextField
          label="From"
          type="datetime-local"
          value={from}
          onChange={(e) => setFrom(e.target.value)}
          error={errors.from}
          hint="Your local time"
        />
      </div>
      <AssignmentError error={assign.error} />
      <div>
        <Button type="submit" busy={assign.isPending}>
          Assign device
        </Button>
      </div>
    </form>
  );
}

export function EndAssignmentForm({ deviceId, current, onDone }: { deviceId: string; current: Assignment; onDone?: (message: string) => void }) {
  const end = useEndAssignment(deviceId, (a) =>
    onDone?.(`The ${placementLabel(a.placement).toLowerCase()} assignment ended${a.to ? ` at ${formatDateTime(a.to)}` : ""}.`),
  );
  const [to, setTo] = useState(nowInput);
  const [errors, setErrors] = useState<Errors>({});

  function submit(event: FormEvent) {
    event.preventDefault();
    const parsed = endAssignmentInputSchema.safeParse({ to });
    if (!parsed.success) return setErrors(issuesToErrors(parsed.error));
    if (parsed.data.to <= current.from) return setErrors({ to: "the end must be after the assignment started" });
    setErrors({});
    end.mutate({ assignmentId: current.id, input: parsed.data });
  }

  return (
    <form onSubmit={submit} noValidate aria-labelledby="end-heading" className="card grid gap-4 p-5">
      <h3 id="end-heading" className="text-lg font-bold text-ink">
        End the current assignment
      </h3>
      <p className="text-sm text-ink-soft">
        Recordings made after the end time will no longer be matched to {placementLabel(current.placement)}.
      </p>
      <div className="max-w-xs">
        <TextField label="Ends at" type="datetime-local" value={to} onChange={(e) => setTo(e.target.value)} error={errors.to} hint="Your local time" />
      </div>
      <AssignmentError error={end.error} />
      <div>
        <Button type="submit" variant="danger" busy={end.isPending}>
          End assignment
        </Button>
      </div>
    </form>
  );
}

export function SwapPlacementForm({ deviceId, current, onDone }: { deviceId: string; current: Assignment; onDone?: (message: string) => void }) {
  const swap = useSwapPlacement(deviceId, (a) =>
    onDone?.(`Now worn on the ${placementLabel(a.placement).toLowerCase()} from ${formatDateTime(a.from)}.`),
  );
  const [placement, setPlacement] = useState("");
  const [at, setAt] = useState(nowInput);
  const [errors, setErrors] = useState<Errors>({});

  function submit(event: FormEvent) {
    event.preventDefault();
    const parsed = swapPlacementInputSchema.safeParse({ placement, at });
    if (!parsed.success) return setErrors(issuesToErrors(parsed.error));
    if (parsed.data.placement === current.placement) {
      return setErrors({ placement: "choose a different placement than the current one" });
    }
    if (parsed.data.at <= current.from) return setErrors({ at: "the swap must be after the current assignment started" });
    setErrors({});
    swap.mutate({ assignmentId: current.id, input: parsed.data });
  }

  return (
    <form onSubmit={submit} noValidate aria-labelledby="swap-heading" className="card grid gap-4 p-5">
      <h3 id="swap-heading" className="text-lg font-bold text-ink">
        Swap placement
      </h3>
      <p className="text-sm text-ink-soft">
        Moves the device from the {placementLabel(current.placement).toLowerCase()} to another limb of the same patient:
        the current assignment ends and the new one starts at the same moment.
      </p>
      <div className="grid gap-4 md:grid-cols-3">
        <SelectField label="New placement" value={placement} onChange={(e) => setPlacement(e.target.value)} error={errors.placement}>
          <option value="">Choose a placement</option>
          {PLACEMENT_OPTIONS.filter((p) => p.value !== current.placement).map((p) => (
            <option key={p.value} value={p.value}>
              {p.label}
            </option>
          ))}
        </SelectField>
        <TextField label="Swap at" type="datetime-local" value={at} onChange={(e) => setAt(e.target.value)} error={errors.at} hint="Your local time" />
      </div>
      <AssignmentError error={swap.error} />
      <div>
        <Button type="submit" variant="secondary" busy={swap.isPending}>
          Swap placement
        </Button>
      </div>
    </form>
  );
}
