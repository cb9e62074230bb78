"use client";
import { useCallback, useMemo, useRef, useState } from "react";
import { AgGridReact } from "ag-grid-react";
import {
  CellStyleModule,
  ColumnApiModule,
  InfiniteRowModelModule,
  ModuleRegistry,
  NumberFilterModule,
  RowSelectionModule,
  TextFilterModule,
  TooltipModule,
  type CellClickedEvent,
  type ColDef,
  type GridApi,
  type GridReadyEvent,
  type IDatasource,
  type IGetRowsParams,
  type ICellRendererParams,
} from "ag-grid-community";
import { formatConcentration, formatConcentrationRange } from "@/lib/units";
import { gridToQuery, queryToGrid, type GridFilterModel, type GridSort, type Toolbar } from "@/lib/hits/grid-query";
import { mechanismFilterValues, triageLabels, triageStatuses, type HitQueryParams } from "@/lib/hits/query";
import { LE_KCAL_PER_MOL_PER_LOG_UNIT } from "@/lib/hits/efficiency";
import { hitActions, hitStructureUrl, hitsExportUrl, useHitPages, useHitViews, type HitItem } from "@/hooks/use-hits";
import { Flags } from "../../analyses/_components/labels";
import { MechanismCell, StatusChip } from "./status";
import { HitPanel } from "./hit-panel";
import { formatAlpha } from "@/lib/analysis/alpha";
import { gridTheme } from "@/components/grid/theme";

// Only the modules this grid uses (the all-modules bundle adds about 1.2 MB).
ModuleRegistry.registerModules([
  InfiniteRowModelModule,
  NumberFilterModule,
  TextFilterModule,
  RowSelectionModule,
  TooltipModule,
  CellStyleModule,
  ColumnApiModule,
]);

const BLOCK = 100;
const dash = <span className="text-ink-faint">—</span>;
const fixed = (v: number | null | undefined, d: number) =>
  v === null || v === undefined || !Number.isFinite(v) ? "—" : v.toFixed(d);

const numberFilter = (unit: string) => ({
  filter: "agNumberColumnFilter",
  filterParams: {
    filterOptions: ["greaterThanOrEqual", "lessThanOrEqual", "inRange"],
    maxNumConditions: 1,
    buttons: ["apply", "reset"],
    closeOnApply: true,
    filterPlaceholder: unit,
  },
});
const textFilter = {
  filter: "agTextColumnFilter",
  filterParams: { filterOptions: ["contains"], maxNumConditions: 1, debounceMs: 400 },
};

function Concentration({
  value,
  qualifier,
  ci,
}: {
  value: number | null;
  qualifier?: string | null;
  ci: [number | null, number | null];
}) {
  if (value === null) return dash;
  return (
    <span className="flex flex-col leading-tight">
      <span className="num font-medium">
        {qualifier ?? ""}
        {formatConcentration(value)}
      </span>
      {ci[0] !== null || ci[1] !== null ? (
        <span className="num text-2xs text-ink-muted">95 % CI {formatConcentrationRange(ci[0], ci[1])}</span>
      ) : null}
    </span>
  );
}

type Props = { campaignId: string; canTriage: boolean; canComment: boolean };

export function HitsWorkspace({ campaignId, canTriage, canComment }: Props) {
  const { load, invalidate } = useHitPages(campaignId);
  const views = useHitViews(campaignId);
  const api = useRef<GridApi<HitItem> | null>(null);
  const [toolbar, setToolbar] = useState<Toolbar>({ status: [], mechanism: [], flagged: "", hit: "" });
  const [query, setQuery] = useState<HitQueryParams>({});
  const [total, setTotal] = useState<number | null>(null);
  const [error, setError] = useState<string | null>(null);
  const [notice, setNotice] = useState<string | null>(null);
  const [selected, setSelected] = useState<string[]>([]);
  const [openId, setOpenId] = useState<string | null>(null);
  const [hidden, setHidden] = useState<Set<string>>(new Set(["kic", "kiu", "heavyAtoms"]));
  const [viewName, setViewName] = useState("");
  const [bulk, setBulk] = useState({ status: "confirmed", comment: "", busy: false });

  const Structure = useCallback(
    ({ data }: ICellRendererParams<HitItem>) =>
      data ? (
        // eslint-disable-next-line @next/next/no-img-element -- an SVG drawn by the server per compound; next/image adds nothing here
        <img
          src={hitStructureUrl(campaignId, data.registryId)}
          alt={`Structure of ${data.registryId}`}
          width={112}
          height={68}
          loading="lazy"
          className="my-0.5"
        />
      ) : null,
    [campaignId],
  );

  const columns = useMemo<ColDef<HitItem>[]>(
    () => [
      {
        headerName: "Structure",
        colId: "structure",
        cellRenderer: Structure,
        width: 124,
        sortable: false,
        resizable: false,
      },
      {
        headerName: "Registry ID",
        colId: "registryId",
        field: "registryId",
        width: 150,
        ...textFilter,
        cellRenderer: ({ data }: ICellRendererParams<HitItem>) =>
          data ? (
            <span className="flex flex-col leading-tight">
              <button
                type="button"
                className="text-left font-mono text-sm text-accent hover:underline"
                data-testid="open-panel"
              >
                {data.registryId}
              </button>
              {data.name ? <span className="truncate text-2xs text-ink-muted">{data.name}</span> : null}
            </span>
          ) : (
            <span className="text-2xs text-ink-faint">loading…</span>
          ),
      },
      {
        headerName: "Status",
        colId: "status",
        width: 112,
        cellRenderer: ({ data }: ICellRendererParams<HitItem>) => (data ? <StatusChip status={data.status} /> : null),
      },
      {
        headerName: "Flags",
        colId: "flags",
        width: 150,
        headerTooltip: "Sort puts flagged or ambiguous results together; every flag is shown",
        cellRenderer: ({ data }: ICellRendererParams<HitItem>) =>
          data ? (
            data.flags.length || data.mechanismLabel === "ambiguous" ? (
              <Flags flags={data.flags.length ? data.flags : ["ambiguous-mechanism"]} />
            ) : (
              <span className="text-2xs text-pass">clean</span>
            )
          ) : null,
        cellClass: "overflow-hidden",
      },
      {
        headerName: "Mechanism",
        colId: "mechanism",
        width: 190,
        headerTooltip: "The mechanism call; a chip marks a call that is inadequate or ambiguous (hover it for why)",
        cellRenderer: ({ data }: ICellRendererParams<HitItem>) =>
          data ? <MechanismCell mechanism={data.mechanism} label={data.mechanismLabel} flags={data.flags} /> : null,
      },
      {
        headerName: "Ki",
        colId: "ki",
        width: 158,
        ...numberFilter("Ki in µM"),
        headerTooltip:
          "Inhibition constant from the mechanism study (Kic, Kiu or Ki per model), with 95 % CI. Filter in µM.",
        cellRenderer: ({ data }: ICellRendererParams<HitItem>) =>
          data ? <Concentration value={data.ki} ci={data.kiCi95} /> : null,
      },
      {
        headerName: "Kic",
        colId: "kic",
        width: 110,
        ...numberFilter("Kic in µM"),
        cellClass: "num",
        valueGetter: (p) => (p.data ? formatConcentration(p.data.kic) : ""),
      },
      {
        headerName: "Kiu",
        colId: "kiu",
        width: 110,
        ...numberFilter("Kiu in µM"),
        cellClass: "num",
        valueGetter: (p) => (p.data ? formatConcentration(p.data.kiu) : ""),
      },
      {
        headerName: "α (Kiu/Kic)",
        colId: "alpha",
        width: 104,
        ...numberFilter("α"),
        headerTooltip: "α = Kiu/Kic: 1 noncompetitive, → 0 uncompetitive, → ∞ competitive (shown as ∞).",
        cellClass: "num",
        valueGetter: (p) => (p.data ? formatAlpha(p.data.alpha, p.data.mechanism) : ""),
      },
      {
        headerName: "IC50",
        colId: "ic50",
        width: 158,
        ...numberFilter("IC50 in µM"),
        headerTooltip: "Dose-response IC50 with 95 % CI; > or < when outside the tested range. Filter in µM.",
        cellRenderer: ({ data }: ICellRendererParams<HitItem>) =>
          data ? <Concentration value={data.ic50} qualifier={data.ic50Qualifier} ci={data.ic50Ci95} /> : null,
      },
      {
        headerName: "Hill slope",
        colId: "hill",
        width: 96,
        ...numberFilter("Hill slope"),
        cellClass: "num",
        valueGetter: (p) => (p.data ? fixed(p.data.hill, 2) : ""),
      },
      {
        headerName: "Single-dose inhibition (%)",
        colId: "pctInhibition",
        width: 130,
        ...numberFilter("%"),
        cellRenderer: ({ data }: ICellRendererParams<HitItem>) =>
          data ? (
            data.pctInhibition === null ? (
              dash
            ) : (
              <span className="num">
                {data.pctInhibition.toFixed(1)}{" "}
                {data.hit ? <span className="chip bg-accent-soft text-accent-strong">hit</span> : null}
              </span>
            )
          ) : null,
      },
      {
        headerName: "LE (kcal/mol per heavy atom)",
        colId: "le",
        width: 130,
        ...numberFilter("LE"),
        cellClass: "num",
        headerTooltip: `Ligand efficiency ${LE_KCAL_PER_MOL_PER_LOG_UNIT}·pKi / heavy atoms at 298 K (Hopkins, Groom & Alex 2004)`,
        valueGetter: (p) => (p.data ? fixed(p.data.le, 2) : ""),
      },
      {
        headerName: "LipE (pKi − cLogP)",
        colId: "lipe",
        width: 112,
        ...numberFilter("LipE"),
        cellClass: "num",
        headerTooltip: "Lipophilic efficiency pKi − cLogP (Leeson & Springthorpe 2007)",
        valueGetter: (p) => (p.data ? fixed(p.data.lipe, 2) : ""),
      },
      {
        headerName: "MW (g/mol)",
        colId: "mw",
        width: 104,
        ...numberFilter("g/mol"),
        cellClass: "num",
        valueGetter: (p) => (p.data ? fixed(p.data.mw, 1) : ""),
      },
      {
        headerName: "cLogP",
        colId: "clogp",
        width: 84,
        ...numberFilter("cLogP"),
        cellClass: "num",
        valueGetter: (p) => (p.data ? fixed(p.data.clogp, 2) : ""),
      },
      {
        headerName: "Heavy atoms",
        colId: "heavyAtoms",
        width: 96,
        ...numberFilter("count"),
        cellClass: "num",
        valueGetter: (p) => p.data?.heavyAtoms ?? "",
      },
      {
        headerName: "Owner",
        colId: "owner",
        width: 150,
        ...textFilter,
        valueGetter: (p) => p.data?.owner ?? "—",
        headerTooltip: "Who made the current triage decision",
      },
      {
        headerName: "Last tested",
        colId: "lastTested",
        width: 108,
        cellClass: "num",
        valueGetter: (p) => (p.data?.lastTested ? p.data.lastTested.slice(0, 10) : "—"),
        headerTooltip: "Latest upload of a plate run behind a current result (UTC date)",
      },
      {
        headerName: "Comments",
        colId: "comments",
        width: 100,
        ...numberFilter("count"),
        cellClass: "num",
        valueGetter: (p) => p.data?.comments ?? "",
      },
    ],
    [Structure],
  );

  const datasource = useMemo<IDatasource>(
    () => ({
      rowCount: undefined,
      getRows(params: IGetRowsParams) {
        const q = gridToQuery(params.sortModel as GridSort, params.filterModel as GridFilterModel, toolbar);
        setQuery(q);
        load(q, params.endRow - params.startRow, params.startRow)
          .then((page) => {
            setError(null);
            setTotal(page.total);
            params.successCallback(page.items, page.total);
          })
          .catch((e: Error) => {
            setError(e.message);
            params.failCallback();
          });
      },
    }),
    // A new toolbar choice is a new data source: the grid starts again from the first block.
    [load, toolbar],
  );

  const refresh = useCallback(async () => {
    // Drop the cached pages first, or the grid would be refilled from them.
    invalidate();
    api.current?.refreshInfiniteCache();
  }, [invalidate]);

  function toggle(key: "status" | "mechanism", value: string) {
    setToolbar((t) => {
      const cur = t[key] ?? [];
      return { ...t, [key]: cur.includes(value) ? cur.filter((v) => v !== value) : [...cur, value] };
    });
  }

  function applyView(id: string) {
    const v = views.data?.items.find((x) => x.id === id);
    if (!v || !api.current) return;
    const g = queryToGrid(v.state.query);
    const sort = g.sortModel[0];
    api.current.applyColumnState({
      state: v.state.columns.map((c) => ({
        colId: c.colId,
        hide: c.hide ?? false,
        width: c.width ?? undefined,
        pinned: c.pinned ?? null,
        sort: sort?.colId === c.colId ? sort.sort : null,
      })),
      defaultState: { sort: null },
    });
    if (sort && !v.state.columns.some((c) => c.colId === sort.colId))
      api.current.applyColumnState({ state: [{ colId: sort.colId, sort: sort.sort }] });
    api.current.setFilterModel(g.filterModel);
    setHidden(new Set(v.state.columns.filter((c) => c.hide).map((c) => c.colId)));
    setToolbar(g.toolbar);
    setViewName(v.name);
    setNotice(`View "${v.name}" applied.`);
  }

  async function saveView() {
    if (!api.current || !viewName.trim()) return;
    const columns = api.current
      .getColumnState()
      .filter((c) => c.colId !== "ag-Grid-SelectionColumn")
      .map((c) => ({
        colId: c.colId,
        hide: c.hide ?? false,
        width: c.width ?? null,
        pinned: (c.pinned === "left" || c.pinned === "right" ? c.pinned : null) as "left" | "right" | null,
      }));
    try {
      await hitActions.saveView(campaignId, viewName.trim(), { columns, query });
      await views.mutate();
      setNotice(`View "${viewName.trim()}" saved (columns, filters and sort).`);
    } catch (e) {
      setError((e as Error).message);
    }
  }

  async function deleteView(id: string) {
    try {
      await hitActions.deleteView(campaignId, id);
      await views.mutate();
      setNotice("View deleted.");
    } catch (e) {
      setError((e as Error).message);
    }
  }

  async function applyBulk() {
    setBulk((b) => ({ ...b, busy: true }));
    try {
      const r = await hitActions.setStatusMany(campaignId, selected, bulk.status, bulk.comment);
      setNotice(
        `Status "${triageLabels[bulk.status as keyof typeof triageLabels]}" recorded for ${r.changed} compound${r.changed === 1 ? "" : "s"}${r.unchanged ? ` (${r.unchanged} already had it)` : ""}.`,
      );
      api.current?.deselectAll();
      setBulk((b) => ({ ...b, comment: "", busy: false }));
      await refresh();
    } catch (e) {
      setError((e as Error).message);
      setBulk((b) => ({ ...b, busy: false }));
    }
  }

  function showColumn(colId: string, visible: boolean) {
    api.current?.setColumnsVisible([colId], visible);
    setHidden((h) => {
      const n = new Set(h);
      if (visible) n.delete(colId);
      else n.add(colId);
      return n;
    });
  }

  const sorted = query.sort !== undefined;
  const filtered = Object.keys(query).some((k) => k !== "sort" && k !== "dir");

  return (
    <div className="flex flex-col gap-3">
      <div className="card flex flex-col gap-2 p-3 text-sm">
        <div className="flex flex-wrap items-center gap-x-4 gap-y-2">
          <span className="text-xs font-medium text-ink-muted">Status</span>
          <span className="flex flex-wrap gap-1" role="group" aria-label="Filter by triage status">
            {triageStatuses.map((s) => (
              <button
                key={s}
                type="button"
                aria-pressed={toolbar.status?.includes(s)}
                onClick={() => toggle("status", s)}
                className={`chip border ${toolbar.status?.includes(s) ? "border-accent bg-accent-soft text-accent-strong" : "border-rule bg-paper-raised text-ink-soft"}`}
              >
                {triageLabels[s]}
              </button>
            ))}
          </span>
          <span className="text-xs font-medium text-ink-muted">Mechanism</span>
          <span className="flex flex-wrap gap-1" role="group" aria-label="Filter by mechanism">
            {mechanismFilterValues.map((m) => (
              <button
                key={m}
                type="button"
                aria-pressed={toolbar.mechanism?.includes(m)}
                onClick={() => toggle("mechanism", m)}
                className={`chip border ${toolbar.mechanism?.includes(m) ? "border-accent bg-accent-soft text-accent-strong" : "border-rule bg-paper-raised text-ink-soft"}`}
              >
                {m === "none" ? "no mechanism study" : m}
              </button>
            ))}
          </span>
          <label className="flex items-center gap-1 text-xs text-ink-muted">
            Fit quality
            <select
              className="input w-auto py-0.5 text-xs"
              value={toolbar.flagged}
              onChange={(e) => setToolbar((t) => ({ ...t, flagged: e.target.value as Toolbar["flagged"] }))}
              aria-label="Fit quality"
            >
              <option value="">all</option>
              <option value="false">clean only</option>
              <option value="true">flagged or ambiguous only</option>
            </select>
          </label>
          <label className="flex items-center gap-1 text-xs text-ink-muted">
            Single-dose hit
            <select
              className="input w-auto py-0.5 text-xs"
              value={toolbar.hit}
              onChange={(e) => setToolbar((t) => ({ ...t, hit: e.target.value as Toolbar["hit"] }))}
              aria-label="Single-dose hit"
            >
              <option value="">all</option>
              <option value="true">hits</option>
              <option value="false">not hits</option>
            </select>
          </label>
        </div>
        <div className="flex flex-wrap items-center gap-2 border-t border-rule pt-2">
          <span className="text-xs font-medium text-ink-muted">My views</span>
          <select
            className="input w-auto py-0.5 text-xs"
            value=""
            onChange={(e) => e.target.value && applyView(e.target.value)}
            aria-label="Apply a saved view"
          >
            <option value="">{views.data?.items.length ? "apply a saved view…" : "no saved views yet"}</option>
            {views.data?.items.map((v) => (
              <option key={v.id} value={v.id}>
                {v.name}
              </option>
            ))}
          </select>
          <input
            className="input w-44 py-0.5 text-xs"
            placeholder="view name"
            value={viewName}
            onChange={(e) => setViewName(e.target.value)}
            aria-label="View name"
            maxLength={80}
          />
          <button type="button" className="btn-quiet py-0.5 text-xs" onClick={saveView} disabled={!viewName.trim()}>
            Save view
          </button>
          {views.data?.items.find((v) => v.name.toLowerCase() === viewName.trim().toLowerCase()) ? (
            <button
              type="button"
              className="btn-quiet py-0.5 text-xs"
              onClick={() =>
                deleteView(views.data!.items.find((v) => v.name.toLowerCase() === viewName.trim().toLowerCase())!.id)
              }
            >
              Delete view
            </button>
          ) : null}
          <details className="relative">
            <summary className="btn-quiet cursor-pointer list-none py-0.5 text-xs">Columns</summary>
            <div className="absolute z-20 mt-1 grid w-56 gap-1 rounded border border-rule bg-paper-raised p-2 shadow-card">
              {columns
                .filter((c) => c.colId !== "registryId")
                .map((c) => (
                  <label key={c.colId} className="flex items-center gap-2 text-xs">
                    <input
                      type="checkbox"
                      checked={!hidden.has(c.colId!)}
                      onChange={(e) => showColumn(c.colId!, e.target.checked)}
                    />
                    {c.headerName}
                  </label>
                ))}
            </div>
          </details>
          <span className="ml-auto flex items-center gap-2">
            <a
              className="btn-quiet py-0.5 text-xs"
              href={hitsExportUrl(campaignId, query, "xlsx")}
              download
              data-testid="export-xlsx"
            >
              Export XLSX
            </a>
            <a
              className="btn-quiet py-0.5 text-xs"
              href={hitsExportUrl(campaignId, query, "csv")}
              download
              data-testid="export-csv"
            >
              Export CSV
            </a>
          </span>
        </div>
      </div>

      {canTriage && selected.length > 0 ? (
        <div
          className="card flex flex-wrap items-center gap-2 border-accent/40 bg-accent-soft/40 px-3 py-2 text-sm"
          role="region"
          aria-label="Set the status of the selection"
        >
          <span className="font-medium">{selected.length} selected</span>
          <select
            className="input w-auto py-0.5 text-xs"
            value={bulk.status}
            onChange={(e) => setBulk((b) => ({ ...b, status: e.target.value }))}
            aria-label="New status for the selection"
          >
            {triageStatuses.map((s) => (
              <option key={s} value={s}>
                {triageLabels[s]}
              </option>
            ))}
          </select>
          <input
            className="input w-72 py-0.5 text-xs"
            placeholder="comment (kept in each compound's history)"
            value={bulk.comment}
            onChange={(e) => setBulk((b) => ({ ...b, comment: e.target.value }))}
            maxLength={2000}
          />
          <button type="button" className="btn-primary py-0.5 text-xs" disabled={bulk.busy} onClick={applyBulk}>
            Set status for {selected.length}
          </button>
        </div>
      ) : null}

      <div className="flex flex-wrap items-baseline gap-3 text-xs text-ink-muted">
        <span className="num text-sm text-ink" data-testid="hit-count">
          {total === null
            ? "Loading…"
            : total === 0
              ? "No compounds match."
              : `${total.toLocaleString("en")} compound${total === 1 ? "" : "s"}`}
        </span>
        <span>
          {sorted
            ? `Sorted by ${columns.find((c) => c.colId === query.sort)?.headerName ?? query.sort}, ${query.dir === "desc" ? "descending" : "ascending"} (blanks last).`
            : "Ranked: clean results by Ki, then IC50, then single-dose inhibition; flagged or ambiguous results after the clean ones."}{" "}
          {filtered ? "Filters on." : ""} Concentrations shown with their unit; column filters take µM.
        </span>
        {notice ? (
          <span role="status" className="text-pass">
            {notice}
          </span>
        ) : null}
      </div>
      {error ? (
        <p role="alert" className="rounded bg-fail-soft px-2 py-1.5 text-sm text-fail">
          {error}
        </p>
      ) : null}

      <div style={{ height: 640 }} data-testid="hits-grid">
        <AgGridReact<HitItem>
          theme={gridTheme}
          columnDefs={columns}
          defaultColDef={{
            sortable: true,
            resizable: true,
            suppressMovable: true,
            sortingOrder: ["asc", "desc", null],
            wrapHeaderText: true,
            autoHeaderHeight: true,
          }}
          rowModelType="infinite"
          datasource={datasource}
          cacheBlockSize={BLOCK}
          maxBlocksInCache={20}
          rowHeight={78}
          headerHeight={44}
          getRowId={(p) => p.data.registryId}
          rowSelection={
            canTriage
              ? { mode: "multiRow", checkboxes: true, headerCheckbox: false, enableClickSelection: false }
              : undefined
          }
          onSelectionChanged={(e) => setSelected(e.api.getSelectedRows().map((r) => r.registryId))}
          onCellClicked={(e: CellClickedEvent<HitItem>) => {
            if (e.data && e.column.getColId() !== "ag-Grid-SelectionColumn") setOpenId(e.data.registryId);
          }}
          onGridReady={(e: GridReadyEvent<HitItem>) => {
            api.current = e.api;
            e.api.setColumnsVisible([...hidden], false);
          }}
          tooltipShowDelay={300}
          overlayNoRowsTemplate="No compounds match these filters."
        />
      </div>
      {openId ? (
        <HitPanel
          campaignId={campaignId}
          registryId={openId}
          canTriage={canTriage}
          canComment={canComment}
          onClose={() => setOpenId(null)}
          onChanged={() => void refresh()}
        />
      ) : null}
    </div>
  );
}
