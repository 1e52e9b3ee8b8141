import { useMemo, useState } from "react";
import { Link } from "react-router-dom";
import { EmptyState, ErrorState, LoadingState, PageHeader, SelectField, Table, Td, TextField, Th } from "@/components/ui";
import { DEVICE_STATUSES } from "@pendula/ingest-server/contracts";
import { formatDate } from "@/lib/format";
import { patientText, useDevices, type Device } from "../api/devices";
import { placementLabel } from "@/lib/placement-labels";
import { DeviceStatusBadge, deviceStatusLabel } from "./device-status-badge";

const KIND_LABEL: Record<string, string> = { imu6: "6-axis IMU", imu9: "9-axis IMU" };

function matches(device: Device, search: string, status: string): boolean {
  if (status && device.status !== status) return false;
  if (!search) return true;
  const s = search.toLowerCase();
  return (
    device.serial.toLowerCase().includes(s) ||
    (device.firmware ?? "").toLowerCase().includes(s) ||
    (device.assignment ? patientText(device.assignment).toLowerCase().includes(s) : false)
  );
}

export function DeviceInventoryPage() {
  const devices = useDevices();
  const [search, setSearch] = useState("");
  const [status, setStatus] = useState("");
  const shown = useMemo(
    () => (devices.data ?? []).filter((d) => matches(d, search.trim(), status)).sort((a, b) => a.serial.localeCompare(b.serial)),
    [devices.data, search, status],
  );

  return (
    <div>
      <PageHeader eyebrow="Administration" title="Device inventory">
        Every sensor the clinic owns, where it is worn now, and its history. Open a device to assign, end or swap a
        placement.
      </PageHeader>
      {devices.isPending ? (
        <LoadingState label="Loading devices…" />
      ) : devices.isError ? (
        <ErrorState title="The inventory could not be loaded" error={devices.error} onRetry={() => void devices.refetch()} />
      ) : devices.data.length === 0 ? (
        <EmptyState title="No devices registered yet">Devices appear here once they are added to the inventory.</EmptyState>
      ) : (
        <div className="grid gap-4">
          <StatusCounts devices={devices.data} status={status} onStatus={setStatus} />
          <div className="grid max-w-2xl gap-4 sm:grid-cols-2" role="search" aria-label="Filter devices">
            <TextField
              label="Search"
              hint="Serial, firmware or patient"
              type="search"
              value={search}
              onChange={(e) => setSearch(e.target.value)}
            />
            <SelectField label="Status" value={status} onChange={(e) => setStatus(e.target.value)}>
              <option value="">All statuses</option>
              {DEVICE_STATUSES.map((s) => (
                <option key={s} value={s}>
                  {deviceStatusLabel(s)}
                </option>
              ))}
            </SelectField>
          </div>
          <p className="text-sm text-ink-soft" aria-live="polite">
            Showing {shown.length} of {devices.data.length} devices.
          </p>
          {shown.length === 0 ? (
            <EmptyState title="No device matches these filters">Clear the search or choose another status.</EmptyState>
          ) : (
            <Table caption="Devices, sorted by serial">
              <thead>
                <tr>
                  <Th>Serial</Th>
                  <Th>Kind</Th>
                  <Th>Firmware</Th>
                  <Th>Status</Th>
                  <Th>Current assignment</Th>
                </tr>
              </thead>
              <tbody>
                {shown.map((d) => (
                  <tr key={d.id}>
                    <Td>
                      <Link
                        to={`/admin/devices/${d.id}`}
                        className="font-mono font-semibold text-sky-deep underline decoration-sky/40 underline-offset-2 hover:decoration-sky-deep"
                      >
                        {d.serial}
                      </Link>
                    </Td>
                    <Td>{KIND_LABEL[d.kind] ?? d.kind}</Td>
                    <Td className="font-mono text-xs">{d.firmware ?? "—"}</Td>
                    <Td>
                      <DeviceStatusBadge status={d.status} />
                    </Td>
                    <Td>
                      {d.assignment ? (
                        <span>
                          <span className="font-semibold">{patientText(d.assignment)}</span> ·{" "}
                          {placementLabel(d.assignment.placement)}
                          <span className="block text-xs text-ink-soft">since {formatDate(d.assignment.from)}</span>
                        </span>
                      ) : (
                        <span className="text-ink-soft">Not assigned</span>
                      )}
                    </Td>
                  </tr>
                ))}
              </tbody>
            </Table>
          )}
        </div>
      )}
    </div>
  );
}

/** One button per status with its count: the quickest way to find a spare device. */
function StatusCounts({ devices, status, onStatus }: { devices: Device[]; status: string; onStatus: (s: string) => void }) {
  const counts = DEVICE_STATUSES.map((s) => ({ s, n: devices.filter((d) => d.status === s).length })).filter((c) => c.n > 0);
  return (
    <div className="flex flex-wrap gap-2" role="group" aria-label="Devices by status">
      {counts.map(({ s, n }) => (
        <button
          key={s}
          type="button"
          aria-pressed={status === s}
          onClick={() => onStatus(status === s ? "" : s)}
          className="inline-flex items-center gap-2 rounded-full border border-line bg-paper px-3 py-1 text-sm font-semibold text-ink hover:bg-sand-deep aria-pressed:border-ink aria-pressed:bg-sand-deep"
        >
          <span className="tabular">{n}</span> {deviceStatusLabel(s).toLowerCase()}
          {status === s ? <span aria-hidden="true">✓</span> : null}
        </button>
      ))}
    </div>
  );
}
