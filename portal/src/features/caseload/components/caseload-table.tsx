import {
  createColumnHelper,
  flexRender,
  getCoreRowModel,
  getFilteredRowModel,
  getSortedRowModel,
  useReactTable,
  type SortingState,
} from "@tanstack/react-table";
import { useMemo, useRef, useState, type ReactNode } from "react";
import { Link } from "react-router-dom";
import { labelWithUnit, metricDefinition } from "@pendula/ingest-server/contracts";
import { IconAlert, IconCheck, IconInfo, IconSearch, IconSort, IconWave } from "@/components/icons";
import { Badge, EmptyState, SelectField, TextField } from "@/components/ui";
import type { BadgeTone } from "@/components/ui/badge";
import { conditionLabel } from "@/lib/condition-labels";
import { formatDateTime, formatNumber, formatPercent } from "@/lib/format";
import { orderedFlags, flagRank, type CaseloadRow, type NamedFlag } from "../api/get-caseload";

// The latest values the caseload shows, named and rounded by the metric catalogue.
const SPEED = metricDefinition("walkingSpeedMPerS")!;
const CADENCE = metricDefinition("cadenceStepsPerMin")!;
const PCI = metricDefinition("phaseCoordinationIndexPct")!;

const col = createColumnHelper<CaseloadRow>();

// How each kind of flag looks: always an icon and words (the server's label), never colour alone.
const FLAG_LOOK: Record<string, { tone: BadgeTone; icon: ReactNode }> = {
  worsened: { tone: "alert", icon: <IconAlert /> },
  "left-right-coordination": { tone: "caution", icon: <IconWave /> },
  "coupling-drop": { tone: "caution", icon: <IconWave /> },
  "coordination-change": { tone: "caution", icon: <IconWave /> },
  "phase-shift": { tone: "info", icon: <IconWave /> },
  improved: { tone: "good", icon: <IconCheck /> },
  other: { tone: "info", icon: <IconInfo /> },
};
const FLAGS_SHOWN = 3;

function FlagList({ flags }: { flags: NamedFlag[] }) {
  const shown = flags.slice(0, FLAGS_SHOWN);
  const rest = flags.slice(FLAGS_SHOWN);
  return (
    <ul className="flex flex-col items-start gap-1" aria-label="Flags, most urgent first">
      {shown.map((f, i) => {
        const look = FLAG_LOOK[f.kind] ?? FLAG_LOOK.other!;
        return (
          <li key={`${f.metricKey}-${f.flag}-${i}`}>
            <Badge tone={look.tone} icon={look.icon}>
              {f.label}
            </Badge>
          </li>
        );
      })}
      {rest.length ? (
        <li className="text-xs text-ink-soft" title={rest.map((f) => f.label).join("; ")}>
          {`and ${rest.length} more: ${rest.map((f) => f.label).join("; ")}`}
        </li>
      ) : null}
    </ul>
  );
}

function daysAgo(iso: string | null | undefined): string {
  if (!iso) return "never";
  const d = Math.floor((Date.now() - Date.parse(iso)) / 86_400_000);
  return d <= 0 ? "today" : d === 1 ? "yesterday" : `${d} days ago`;
}

// Nulls sort last in both directions so "no data" never hides the patients that have data. The
// table flips a sorting function's answer for descending order, so the null rule flips with it.
const nullsLastBy = (isDesc: () => boolean) => (a: number | null | undefined, b: number | null | undefined) => {
  const last = isDesc() ? -1 : 1;
  if (a == null && b == null) return 0;
  if (a == null) return last;
  if (b == null) return -last;
  return a - b;
};

export function CaseloadTable({ rows }: { rows: CaseloadRow[] }) {
  const [sorting, setSorting] = useState<SortingState>([{ id: "lastUpload", desc: true }]);
  const sortingRef = useRef(sorting);
  sortingRef.current = sorting;
  const [search, setSearch] = useState("");
  const [condition, setCondition] = useState("");
  const [flaggedOnly, setFlaggedOnly] = useState(false);

  const columns = useMemo(() => {
    const nullsLast = nullsLastBy(() => sortingRef.current[0]?.desc ?? false);
    return [
      col.accessor("displayName", {
        id: "patient",
        header: "Patient",
        cell: (c) => (
          <Link to={`/clinician/patients/${c.row.original.id}`} className="font-semibold text-sky-deep underline-offset-2 hover:underline">
            {c.getValue()}
          </Link>
        ),
      }),
      col.accessor((r) => r.condition ?? "", {
        id: "condition",
        header: "Condition",
        cell: (c) => conditionLabel(c.getValue(), { short: true }),
        filterFn: "equalsString",
      }),
      col.accessor((r) => (r.lastUploadAt ? Date.parse(r.lastUploadAt) : null), {
        id: "lastUpload",
        header: "Last upload",
        sortingFn: (a, b) => nullsLast(a.getValue("lastUpload"), b.getValue("lastUpload")),
        cell: (c) => (
          <span title={c.row.original.lastUploadAt ? formatDateTime(c.row.original.lastUploadAt) : undefined}>{daysAgo(c.row.original.lastUploadAt)}</span>
        ),
      }),
      col.accessor((r) => r.adherencePct ?? null, {
        id: "adherence",
        header: "Adherence (4 wk)",
        sortingFn: (a, b) => nullsLast(a.getValue("adherence"), b.getValue("adherence")),
        cell: (c) => {
          const v = c.getValue();
          if (v == null) return "—";
          return v < 50 ? <Badge tone="caution">{formatPercent(v)}</Badge> : <span className="tabular">{formatPercent(v)}</span>;
        },
      }),
      col.accessor((r) => (r.flags ? flagRank(r.flags) : null), {
        id: "flags",
        header: "Flags",
        // Most urgent first when sorted descending: the worst flag decides, then how many there are.
        sortingFn: (a, b) => nullsLast(a.getValue("flags"), b.getValue("flags")),
        cell: (c) => {
          if (!c.row.original.flags) return "—";
          const flags = orderedFlags(c.row.original.flags);
          if (!flags.length) return <span className="text-ink-soft">none</span>;
          return <FlagList flags={flags} />;
        },
      }),
      col.accessor((r) => r.latest?.walkingSpeedMPerS ?? null, {
        id: "speed",
        header: labelWithUnit(SPEED),
        sortingFn: (a, b) => nullsLast(a.getValue("speed"), b.getValue("speed")),
        cell: (c) => <span className="tabular">{formatNumber(c.getValue(), SPEED.decimals)}</span>,
      }),
      col.accessor((r) => r.latest?.cadenceStepsPerMin ?? null, {
        id: "cadence",
        header: labelWithUnit(CADENCE),
        sortingFn: (a, b) => nullsLast(a.getValue("cadence"), b.getValue("cadence")),
        cell: (c) => <span className="tabular">{formatNumber(c.getValue(), CADENCE.decimals)}</span>,
      }),
      col.accessor((r) => r.latest?.phaseCoordinationIndexPct ?? null, {
        id: "pci",
        // The short name: the column is narrow.
        header: labelWithUnit({ label: PCI.shortLabel, unitText: PCI.unitText }),
        sortingFn: (a, b) => nullsLast(a.getValue("pci"), b.getValue("pci")),
        cell: (c) => <span className="tabular">{formatNumber(c.getValue(), PCI.decimals)}</span>,
      }),
    ];
  }, []);

  const data = useMemo(() => (flaggedOnly ? rows.filter((r) => (r.flags?.length ?? 0) > 0) : rows), [rows, flaggedOnly]);
  const table = useReactTable({
    data,
    columns,
    state: { sorting, globalFilter: search, columnFilters: condition ? [{ id: "condition", value: condition }] : [] },
    onSortingChange: setSorting,
    getCoreRowModel: getCoreRowModel(),
    getSortedRowModel: getSortedRowModel(),
    getFilteredRowModel: getFilteredRowModel(),
    // Search looks at names and research ids only, not at numbers.
    globalFilterFn: (row, _id, value: string) => {
      const q = value.trim().toLowerCase();
      if (!q) return true;
      return `${row.original.displayName} ${row.original.researchId ?? ""}`.toLowerCase().includes(q);
    },
  });
  const conditions = [...new Set(rows.map((r) => r.condition))].sort();
  const shown = table.getRowModel().rows;

  return (
    <div className="flex flex-col gap-4">
      <div className="no-print grid gap-3 sm:grid-cols-[2fr_1fr_auto] sm:items-end">
        <div className="relative">
          <TextField label="Search patients" type="search" value={search} onChange={(e) => setSearch(e.target.value)} placeholder="Name or research id" className="pl-9" />
          <IconSearch className="pointer-events-none absolute bottom-3 left-3 text-ink-faint" />
        </div>
        <SelectField label="Condition" value={condition} onChange={(e) => setCondition(e.target.value)}>
          <option value="">All conditions</option>
          {conditions.map((c) => (
            <option key={c} value={c}>
              {conditionLabel(c, { short: true })}
            </option>
          ))}
        </SelectField>
        <label className="flex items-center gap-2 pb-2 text-sm font-semibold">
          <input type="checkbox" className="size-4 accent-moss" checked={flaggedOnly} onChange={(e) => setFlaggedOnly(e.target.checked)} />
          Flagged only
        </label>
      </div>
      <p className="text-sm text-ink-soft" aria-live="polite">
        Showing {shown.length} of {rows.length} patients
      </p>
      {shown.length === 0 ? (
        <EmptyState title="No patients match">Clear the search or choose another condition.</EmptyState>
      ) : (
        <div className="card overflow-x-auto">
          <table className="w-full border-collapse text-left text-sm">
            <caption className="sr-only">Caseload. Column headers sort the table.</caption>
            <thead>
              {table.getHeaderGroups().map((hg) => (
                <tr key={hg.id}>
                  {hg.headers.map((h) => {
                    const dir = h.column.getIsSorted();
                    return (
                      <th
                        key={h.id}
                        scope="col"
                        aria-sort={dir === "asc" ? "ascending" : dir === "desc" ? "descending" : "none"}
                        className="border-b border-line bg-sand px-4 py-2 font-semibold"
                      >
                        <button type="button" onClick={h.column.getToggleSortingHandler()} className="inline-flex items-center gap-1 rounded hover:text-moss-deep">
                          {flexRender(h.column.columnDef.header, h.getContext())}
                          <IconSort sortDir={dir} />
                        </button>
                      </th>
                    );
                  })}
                </tr>
              ))}
            </thead>
            <tbody>
              {shown.map((row) => (
                <tr key={row.id} className="hover:bg-sand/60">
                  {row.getVisibleCells().map((cell) => (
                    <td key={cell.id} className="border-b border-line/70 px-4 py-2.5">
                      {flexRender(cell.column.columnDef.cell, cell.getContext())}
                    </td>
                  ))}
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
    </div>
  );
}
