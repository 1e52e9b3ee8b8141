import { useState } from "react";
import { Link, useParams } from "react-router-dom";
import { EmptyState, ErrorState, FormMessage, LoadingState, PageHeader, Section, Table, Td, Th } from "@/components/ui";
import { formatDateTime } from "@/lib/format";
import { useDeviceAssignments } from "../api/device-assignments";
import { patientText, useDevice } from "../api/devices";
import { placementLabel } from "@/lib/placement-labels";
import { AssignDeviceForm, EndAssignmentForm, SwapPlacementForm } from "./assignment-forms";
import { AssignmentTimeline } from "./assignment-timeline";
import { DeviceStatusBadge } from "./device-status-badge";

function BackLink() {
  return (
    <Link to="/admin/devices" className="text-sm font-semibold text-sky-deep underline underline-offset-2">
      ← All devices
    </Link>
  );
}

export function DevicePage() {
  const { deviceId = "" } = useParams();
  const device = useDevice(deviceId);
  const history = useDeviceAssignments(deviceId);
  // Lives here, not in the forms: a successful change swaps which form is shown, and the
  // confirmation must outlive the form that made it.
  const [notice, setNotice] = useState<string | null>(null);

  if (device.isPending) return <LoadingState label="Loading device…" />;
  if (device.isError) return <ErrorState title="The device could not be loaded" error={device.error} onRetry={() => void device.refetch()} />;
  if (device.data === null) {
    return (
      <EmptyState title="No such device" action={<BackLink />}>
        The inventory has no device with this id.
      </EmptyState>
    );
  }
  const d = device.data;
  const open = history.data?.find((a) => a.to === null) ?? d.assignment ?? null;
  const retired = d.status === "retired";

  return (
    <div>
      <BackLink />
      <PageHeader eyebrow="Device" title={<span className="font-mono">{d.serial}</span>}>
        <span className="flex flex-wrap items-center gap-3">
          <DeviceStatusBadge status={d.status} />
          <span>{d.kind === "imu9" ? "9-axis IMU" : d.kind === "imu6" ? "6-axis IMU" : d.kind}</span>
          <span>Firmware {d.firmware ?? "unknown"}</span>
        </span>
      </PageHeader>

      <Section id="history" title="Assignment history" description="Which patient and limb this device was worn on, over time.">
        {history.isPending ? (
          <LoadingState label="Loading history…" />
        ) : history.isError ? (
          <ErrorState title="The history could not be loaded" error={history.error} onRetry={() => void history.refetch()} />
        ) : history.data.length === 0 ? (
          <EmptyState title="Never assigned">This device has not been worn by anyone yet.</EmptyState>
        ) : (
          <div className="grid gap-4">
            <AssignmentTimeline assignments={history.data} />
            <Table caption="Assignment periods, oldest first">
              <thead>
                <tr>
                  <Th>Patient</Th>
                  <Th>Placement</Th>
                  <Th>From</Th>
                  <Th>To</Th>
                </tr>
              </thead>
              <tbody>
                {history.data.map((a) => (
                  <tr key={a.id}>
                    <Td className="font-semibold">{patientText(a)}</Td>
                    <Td>{placementLabel(a.placement)}</Td>
                    <Td className="tabular">{formatDateTime(a.from)}</Td>
                    <Td className="tabular">{a.to ? formatDateTime(a.to) : <strong>ongoing</strong>}</Td>
                  </tr>
                ))}
              </tbody>
            </Table>
          </div>
        )}
      </Section>

      <Section id="change" title="Change the assignment">
        {notice ? (
          <div className="mb-4">
            <FormMessage tone="success">
              <span aria-hidden="true">✓ </span>
              {notice}
            </FormMessage>
          </div>
        ) : null}
        {retired ? (
          <EmptyState title="Retired device">A retired device cannot be assigned again.</EmptyState>
        ) : open ? (
          <div className="grid gap-4">
            <p className="text-ink">
              Worn now by <strong>{patientText(open)}</strong> on the <strong>{placementLabel(open.placement).toLowerCase()}</strong>{" "}
              since {formatDateTime(open.from)}.
            </p>
            <SwapPlacementForm key={`swap-${open.id}`} deviceId={d.id} current={open} onDone={setNotice} />
            <EndAssignmentForm key={`end-${open.id}`} deviceId={d.id} current={open} onDone={setNotice} />
          </div>
        ) : (
          <AssignDeviceForm deviceId={d.id} serial={d.serial} onDone={setNotice} />
        )}
      </Section>
    </div>
  );
}
