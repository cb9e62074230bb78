"use client";
import Link from "next/link";
import { useMemo, useState } from "react";
import { AgGridReact } from "ag-grid-react";
import {
  ClientSideRowModelModule,
  ModuleRegistry,
  TooltipModule,
  type ColDef,
  type SortChangedEvent,
} from "ag-grid-community";
import { useCompoundSearch, type CompoundItem } from "@/hooks/use-compounds";
import { gridTheme } from "@/components/grid/theme";

// Only the modules this grid uses (the all-modules bundle adds about 1.2 MB; tooltips for the donor/acceptor header).
// The page of rows comes from the server, already searched, filtered, sorted and paged.
ModuleRegistry.registerModules([ClientSideRowModelModule, TooltipModule]);

const PAGE = 50;
const fmt = (x: number, d: number) => (Number.isFinite(x) ? x.toFixed(d) : "—");

function Structure({ data }: { data?: CompoundItem }) {
  if (!data?.svg) return <span className="text-2xs text-ink-faint">no drawing</span>;
  // structureSvg output is checked against an allow-list on the server (src/lib/chem/svg.ts).
  return (
    <div
      className="flex h-full items-center"
      aria-label={`Structure of ${data.registryId}`}
      dangerouslySetInnerHTML={{ __html: data.svg }}
    />
  );
}

function IdCell({ data }: { data?: CompoundItem }) {
  if (!data) return null;
  return (
    <Link href={`/compounds/${data.registryId}`} className="font-mono text-sm">
      {data.registryId}
    </Link>
  );
}

const keepServerOrder = () => 0;

/** Numbers right-aligned with tabular figures, whatever the grid's own cell layout. */
function NumCell(p: { valueFormatted?: string | null; value?: unknown }) {
  return <span className="num block w-full text-right">{p.valueFormatted ?? String(p.value ?? "")}</span>;
}
// Our tabular figures plus AG Grid's right alignment (a cellClass replaces the column type's own).
const RIGHT = ["num", "ag-right-aligned-cell", "text-right", "justify-end"];

export function CompoundGrid({
  libraries,
  initial,
}: {
  libraries: { id: string; name: string }[];
  initial: { q: string; substructure: string; library: string };
}) {
  const [q, setQ] = useState(initial.q);
  const [sub, setSub] = useState(initial.substructure);
  const [mwMin, setMwMin] = useState("");
  const [mwMax, setMwMax] = useState("");
  const [library, setLibrary] = useState(initial.library);
  const [applied, setApplied] = useState({
    q: initial.q,
    substructure: initial.substructure,
    mwMin: "",
    mwMax: "",
    library: initial.library,
  });
  const [offset, setOffset] = useState(0);
  const [sort, setSort] = useState<{ sort?: string; dir?: "asc" | "desc" }>({});
  const { data, error, isLoading, isValidating } = useCompoundSearch({ ...applied, ...sort, limit: PAGE, offset });

  const columns = useMemo<ColDef<CompoundItem>[]>(
    () => [
      { headerName: "Structure", field: "svg", cellRenderer: Structure, width: 136, sortable: false },
      {
        headerName: "Registry ID",
        field: "registryId",
        colId: "registryId",
        cellRenderer: IdCell,
        width: 130,
        comparator: keepServerOrder,
      },
      {
        headerName: "Name",
        field: "name",
        colId: "name",
        flex: 1,
        minWidth: 140,
        comparator: keepServerOrder,
        valueFormatter: (p) => p.value ?? "—",
      },
      {
        headerName: "Aliases",
        field: "aliases",
        flex: 1,
        minWidth: 120,
        sortable: false,
        valueFormatter: (p) => (p.value as string[] | undefined)?.join("; ") || "—",
      },
      { headerName: "Formula", field: "formula", width: 130, sortable: false },
      {
        headerName: "MW (g/mol)",
        field: "mw",
        colId: "mw",
        width: 112,
        type: "rightAligned",
        comparator: keepServerOrder,
        valueFormatter: (p) => fmt(p.value as number, 2),
        cellClass: RIGHT,
        cellRenderer: NumCell,
      },
      {
        headerName: "cLogP",
        field: "clogp",
        colId: "clogp",
        width: 88,
        type: "rightAligned",
        comparator: keepServerOrder,
        valueFormatter: (p) => fmt(p.value as number, 2),
        cellClass: RIGHT,
        cellRenderer: NumCell,
      },
      {
        headerName: "TPSA (Å²)",
        field: "tpsa",
        colId: "tpsa",
        width: 100,
        type: "rightAligned",
        comparator: keepServerOrder,
        valueFormatter: (p) => fmt(p.value as number, 1),
        cellClass: RIGHT,
        cellRenderer: NumCell,
      },
      {
        headerName: "Heavy atoms",
        field: "heavyAtoms",
        colId: "heavyAtoms",
        width: 104,
        type: "rightAligned",
        comparator: keepServerOrder,
        cellClass: RIGHT,
        cellRenderer: NumCell,
      },
      {
        headerName: "HBD / HBA",
        colId: "hb",
        flex: 0.5,
        minWidth: 96,
        sortable: false,
        valueGetter: (p) => (p.data ? `${p.data.hbd} / ${p.data.hba}` : ""),
        cellClass: "num",
        headerTooltip: "H-bond donors / acceptors, rule-of-five definition (acceptors = all N and O atoms)",
      },
      {
        headerName: "Match",
        field: "rank",
        width: 150,
        sortable: false,
        hide: !applied.q,
        valueFormatter: (p) => p.value ?? "",
      },
    ],
    [applied.q],
  );

  function apply(e: React.FormEvent) {
    e.preventDefault();
    setOffset(0);
    setApplied({ q: q.trim(), substructure: sub.trim(), mwMin, mwMax, library });
  }

  function onSortChanged(e: SortChangedEvent<CompoundItem>) {
    const s = e.api.getColumnState().find((c) => c.sort);
    setOffset(0);
    setSort(s ? { sort: s.colId, dir: s.sort ?? "asc" } : {});
  }

  const total = data?.total ?? 0;
  const lower = data?.totalIsLowerBound;
  const from = total === 0 ? 0 : offset + 1;
  const to = offset + (data?.items.length ?? 0);

  return (
    <div className="flex flex-col gap-3">
      <form
        onSubmit={apply}
        className="card grid grid-cols-1 gap-3 p-3 md:grid-cols-[2fr_2fr_1fr_1fr_1.3fr_auto]"
        aria-label="Search the registry"
      >
        <label className="text-xs text-ink-muted">
          Registry ID, name or alias
          <input
            className="input mt-1"
            name="q"
            value={q}
            onChange={(e) => setQ(e.target.value)}
            placeholder="INH-000042, AP-014, IVC-40117"
          />
        </label>
        <label className="text-xs text-ink-muted">
          Substructure (SMILES or SMARTS)
          <input
            className="input mt-1 font-mono"
            name="substructure"
            value={sub}
            onChange={(e) => setSub(e.target.value)}
            placeholder="c1ccncc1, C(=O)N, [F,Cl]c1ccccc1"
            spellCheck={false}
          />
        </label>
        <label className="text-xs text-ink-muted">
          MW from (g/mol)
          <input
            className="input mt-1 num"
            name="mwMin"
            inputMode="decimal"
            value={mwMin}
            onChange={(e) => setMwMin(e.target.value)}
          />
        </label>
        <label className="text-xs text-ink-muted">
          MW to (g/mol)
          <input
            className="input mt-1 num"
            name="mwMax"
            inputMode="decimal"
            value={mwMax}
            onChange={(e) => setMwMax(e.target.value)}
          />
        </label>
        <label className="text-xs text-ink-muted">
          Library
          <select className="input mt-1" name="library" value={library} onChange={(e) => setLibrary(e.target.value)}>
            <option value="">All compounds</option>
            {libraries.map((l) => (
              <option key={l.id} value={l.id}>
                {l.name}
              </option>
            ))}
          </select>
        </label>
        <div className="flex items-end">
          <button type="submit" className="btn-primary w-full">
            Search
          </button>
        </div>
      </form>

      {error ? (
        <p role="alert" className="rounded bg-fail-soft px-2 py-1.5 text-sm text-fail">
          {error.message}
        </p>
      ) : null}

      <div className="flex items-center gap-3 text-sm text-ink-muted">
        <span className="num" data-testid="result-count">
          {isLoading
            ? "Searching…"
            : total === 0
              ? "No compounds match."
              : `${from.toLocaleString("en")}–${to.toLocaleString("en")} of ${lower ? "more than " : ""}${total.toLocaleString("en")}`}
        </span>
        {data?.substructure ? (
          <span className="text-xs">
            Fragment read as <code className="font-mono text-ink-soft">{data.substructure.understoodAs}</code>;{" "}
            {data.substructure.candidates.toLocaleString("en")} passed the fingerprint prefilter,{" "}
            {data.substructure.checked.toLocaleString("en")} checked atom by atom
            {data.substructure.timedOut ? " before the time limit (refine the fragment for an exact count)" : ""}.
          </span>
        ) : null}
        {isValidating && !isLoading ? <span className="text-xs">updating…</span> : null}
        <span className="ml-auto flex gap-2">
          <button
            type="button"
            className="btn-quiet"
            disabled={offset === 0}
            onClick={() => setOffset(Math.max(0, offset - PAGE))}
          >
            Previous
          </button>
          <button
            type="button"
            className="btn-quiet"
            disabled={to >= total && !lower}
            onClick={() => setOffset(offset + PAGE)}
          >
            Next
          </button>
        </span>
      </div>

      <div style={{ height: 640 }}>
        <AgGridReact<CompoundItem>
          theme={gridTheme}
          rowData={data?.items ?? []}
          columnDefs={columns}
          defaultColDef={{ resizable: true, sortable: true, suppressMovable: true }}
          rowHeight={84}
          headerHeight={32}
          getRowId={(p) => p.data.id}
          onSortChanged={onSortChanged}
          animateRows={false}
          // Rows arrive after the first layout: with the scrollbar there from the start, the
          // flexible columns are sized for the space that is really visible.
          alwaysShowVerticalScroll
          loading={isLoading}
          overlayNoRowsTemplate="No compounds match."
          tooltipShowDelay={300}
        />
      </div>
    </div>
  );
}
