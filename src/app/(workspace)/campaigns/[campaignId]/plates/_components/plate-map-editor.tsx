"use client";
import { memo, useActionState, useEffect, useMemo, useRef, useState } from "react";
import { useRouter } from "next/navigation";
// Direct module imports keep the reader-export and simulator code (and exceljs) out of the browser bundle.
import {
  countRoles,
  emptyPlateMap,
  parsePlateMapCsv,
  plateMapFromWells,
  plateMapToCsv,
  validatePlateMap,
  WELL_ROLES,
  type PlateMap,
  type PlateMapWell,
  type WellRole,
} from "@/lib/plates/plate-map";
import { assignWells, fillDilutionSeries, type WellPatch } from "@/lib/plates/editor";
import { plateDimensions, rowLabel, wellName, type PlateFormat } from "@/lib/plates/geometry";
import { FormMessage } from "@/components/forms/form-bits";
import { savePlateMapAction } from "../actions";

export type TemplateOption = { id: string; name: string; format: number; wells: PlateMapWell[] };

const roleLabel: Record<WellRole, string> = {
  sample: "sample",
  neutral: "neutral control (0 %)",
  full: "full-inhibition control (100 %)",
  blank: "blank",
  empty: "empty",
};
const roleClass: Record<WellRole, string> = {
  sample: "",
  neutral: "bg-info",
  full: "bg-warn",
  blank: "bg-rule-strong",
  empty: "bg-paper-raised",
};

function sampleStyle(conc: number | undefined, logMin: number, logMax: number): React.CSSProperties {
  if (conc === undefined || conc <= 0) return { background: "hsl(174 30% 88%)", color: "#1d2630" };
  const f = logMax > logMin ? (Math.log10(conc) - logMin) / (logMax - logMin) : 0.5;
  const lightness = Math.round(86 - 56 * f);
  return { background: `hsl(174 55% ${lightness}%)`, color: lightness < 58 ? "#ffffff" : "#1d2630" };
}

type Props = {
  campaignId: string;
  mapId?: string;
  initial: {
    name: string;
    format: PlateFormat;
    wells: PlateMapWell[];
    isTemplate: boolean;
    signalDirection: "falls" | "rises";
  };
  templates: TemplateOption[];
  canWrite: boolean;
  locked: boolean;
};

/**
 * Plate map editor for 96, 384 and 1536 wells: drag to select a block (Shift adds), click a row
 * letter or column number for a whole row or column, then assign a role and contents or fill a
 * dilution series. The grid is plain CSS-grid cells rendered once per change of the map or the
 * selection; the drag rectangle is a single overlay, so a 1536-well plate stays responsive.
 */
export function PlateMapEditor({ campaignId, mapId, initial, templates, canWrite, locked }: Props) {
  const router = useRouter();
  const [format, setFormat] = useState<PlateFormat>(initial.format);
  const [map, setMap] = useState<PlateMap>(() => plateMapFromWells(initial.format, initial.wells));
  const [history, setHistory] = useState<PlateMap[]>([]);
  const [sel, setSel] = useState<Set<number>>(() => new Set());
  const [importIssues, setImportIssues] = useState<string[]>([]);
  const [state, action, pending] = useActionState(savePlateMapAction, null);
  const dims = plateDimensions(format);
  const readOnly = !canWrite;

  useEffect(() => {
    if (state?.ok && state.data && typeof state.data === "object" && "id" in state.data && !mapId)
      router.push(`/campaigns/${campaignId}/plates/maps/${String(state.data.id)}`);
  }, [state, mapId, router, campaignId]);

  const change = (next: PlateMap) => {
    setHistory((h) => [...h.slice(-30), map]);
    setMap(next);
  };
  const selectedNames = useMemo(() => [...sel].sort((a, b) => a - b).map((i) => map.wells[i]!.well), [sel, map]);
  const counts = useMemo(() => countRoles(map), [map]);
  const issues = useMemo(() => validatePlateMap(map), [map]);
  const listed = useMemo(() => map.wells.filter((w) => w.role !== "empty"), [map]);

  // ---- selection by dragging
  const gridRef = useRef<HTMLDivElement>(null);
  const drag = useRef<{ anchor: number; current: number; add: boolean } | null>(null);
  const [overlay, setOverlay] = useState<{ left: number; top: number; width: number; height: number } | null>(null);
  const cellAt = (target: EventTarget | null): number | null => {
    const el = (target as HTMLElement | null)?.closest?.("[data-i]") as HTMLElement | null;
    return el ? Number(el.dataset.i) : null;
  };
  const blockOf = (a: number, b: number): number[] => {
    const r0 = Math.min(Math.floor(a / dims.columns), Math.floor(b / dims.columns));
    const r1 = Math.max(Math.floor(a / dims.columns), Math.floor(b / dims.columns));
    const c0 = Math.min(a % dims.columns, b % dims.columns);
    const c1 = Math.max(a % dims.columns, b % dims.columns);
    const out: number[] = [];
    for (let r = r0; r <= r1; r++) for (let c = c0; c <= c1; c++) out.push(r * dims.columns + c);
    return out;
  };
  const drawOverlay = (a: number, b: number) => {
    const g = gridRef.current;
    if (!g) return;
    const ea = g.querySelector<HTMLElement>(`[data-i="${a}"]`);
    const eb = g.querySelector<HTMLElement>(`[data-i="${b}"]`);
    if (!ea || !eb) return;
    const left = Math.min(ea.offsetLeft, eb.offsetLeft);
    const top = Math.min(ea.offsetTop, eb.offsetTop);
    const right = Math.max(ea.offsetLeft + ea.offsetWidth, eb.offsetLeft + eb.offsetWidth);
    const bottom = Math.max(ea.offsetTop + ea.offsetHeight, eb.offsetTop + eb.offsetHeight);
    setOverlay({ left, top, width: right - left, height: bottom - top });
  };
  const selectIdx = (idx: number[], add: boolean) => setSel((s) => (add ? new Set([...s, ...idx]) : new Set(idx)));

  // ---- editing steps (pure functions of the plate library)
  const [patch, setPatch] = useState({
    role: "sample" as WellRole,
    compound: "",
    concentrationUm: "",
    substrateUm: "",
    group: "",
  });
  const [series, setSeries] = useState({
    compound: "",
    top: "100",
    factor: "3",
    along: "row" as "row" | "column",
    from: "from" as "from" | "to",
  });
  const [message, setMessage] = useState<string | null>(null);
  const num = (s: string) => (s.trim() === "" ? undefined : Number(s));

  function applyAssign() {
    if (sel.size === 0) return setMessage("Select wells first.");
    const p: { -readonly [K in keyof WellPatch]: WellPatch[K] } = { role: patch.role };
    if (patch.role !== "empty") {
      if (patch.compound.trim()) p.compound = patch.compound.trim();
      const c = num(patch.concentrationUm);
      const s = num(patch.substrateUm);
      if (c !== undefined && !(c >= 0)) return setMessage("Concentration must be a number ≥ 0 (µM).");
      if (s !== undefined && !(s >= 0)) return setMessage("Substrate must be a number ≥ 0 (µM).");
      if (c !== undefined) p.concentrationUm = c;
      if (s !== undefined) p.substrateUm = s;
      if (patch.group.trim()) p.group = patch.group.trim();
    }
    change(assignWells(map, selectedNames, p));
    setMessage(`${sel.size} wells set to ${roleLabel[patch.role]}.`);
  }

  function applySeries() {
    if (sel.size === 0) return setMessage("Select a block of wells first.");
    const idx = [...sel];
    const rows = idx.map((i) => Math.floor(i / dims.columns));
    const cols = idx.map((i) => i % dims.columns);
    const from = wellName({ row: Math.min(...rows), column: Math.min(...cols) });
    const to = wellName({ row: Math.max(...rows), column: Math.max(...cols) });
    const top = Number(series.top);
    if (!(top > 0)) return setMessage("Top concentration must be a positive number (µM).");
    try {
      change(
        fillDilutionSeries(map, {
          from,
          to,
          along: series.along,
          topConcentrationUm: top,
          dilutionFactor: Number(series.factor),
          descendingFrom: series.from,
          ...(series.compound.trim() ? { compound: series.compound.trim() } : {}),
        }),
      );
      setMessage(`Dilution series 1:${series.factor} from ${top} µM along each ${series.along} of ${from}–${to}.`);
    } catch (e) {
      setMessage(e instanceof Error ? e.message : "The series could not be filled.");
    }
  }

  function importCsv(file: File) {
    void file.text().then((text) => {
      const r = parsePlateMapCsv(text, format, file.name);
      if (!r.ok) {
        setImportIssues(r.issues.map((i) => i.text));
        return;
      }
      setImportIssues([]);
      change(r.map);
      setMessage(`Imported ${file.name}.`);
    });
  }

  function exportCsv() {
    try {
      const blob = new Blob([plateMapToCsv(map)], { type: "text/csv" });
      const a = document.createElement("a");
      a.href = URL.createObjectURL(blob);
      a.download = `${(initial.name || "plate-map").replace(/[^\w.-]+/g, "_")}.csv`;
      a.click();
      URL.revokeObjectURL(a.href);
    } catch (e) {
      setMessage(e instanceof Error ? e.message : "Export failed.");
    }
  }

  const concs = listed
    .filter((w) => w.role === "sample" && w.concentrationUm && w.concentrationUm > 0)
    .map((w) => Math.log10(w.concentrationUm!));
  const logMin = concs.length ? Math.min(...concs) : 0;
  const logMax = concs.length ? Math.max(...concs) : 0;
  const cellText = dims.columns <= 12;

  return (
    <div className="grid gap-4 xl:grid-cols-[minmax(0,1fr)_22rem]">
      <div className="flex min-w-0 flex-col gap-2">
        <div className="flex flex-wrap items-center gap-2 text-xs">
          {!mapId && !readOnly ? (
            <label className="flex items-center gap-1">
              Format
              <select
                className="input w-auto py-0.5"
                value={format}
                onChange={(e) => {
                  const f = Number(e.target.value) as PlateFormat;
                  setFormat(f);
                  setMap(emptyPlateMap(f));
                  setHistory([]);
                  setSel(new Set());
                }}
              >
                <option value={96}>96 wells (8 × 12)</option>
                <option value={384}>384 wells (16 × 24)</option>
                <option value={1536}>1536 wells (32 × 48)</option>
              </select>
            </label>
          ) : (
            <span className="chip bg-paper-sunk text-ink-soft">
              {format} wells ({dims.rows} × {dims.columns})
            </span>
          )}
          <span className="text-ink-muted">{sel.size} selected</span>
          <button
            type="button"
            className="btn-quiet py-0.5"
            onClick={() =>
              selectIdx(
                map.wells.map((_, i) => i),
                false,
              )
            }
          >
            Select all
          </button>
          <button type="button" className="btn-quiet py-0.5" onClick={() => setSel(new Set())}>
            Clear selection
          </button>
          {!readOnly ? (
            <button
              type="button"
              className="btn-quiet py-0.5"
              disabled={history.length === 0}
              onClick={() => (setMap(history[history.length - 1]!), setHistory((h) => h.slice(0, -1)))}
            >
              Undo
            </button>
          ) : null}
        </div>
        <div
          ref={gridRef}
          className="relative select-none rounded border border-rule bg-paper-sunk p-1"
          style={{
            maxWidth: dims.columns === 12 ? "34rem" : dims.columns === 24 ? "52rem" : undefined,
            display: "grid",
            gridTemplateColumns: `1.6rem repeat(${dims.columns}, minmax(0, 1fr))`,
            gap: dims.columns > 24 ? 1 : 2,
          }}
          onPointerDown={(e) => {
            const i = cellAt(e.target);
            if (i === null) return;
            (e.currentTarget as HTMLElement).setPointerCapture(e.pointerId);
            drag.current = { anchor: i, current: i, add: e.shiftKey || e.metaKey || e.ctrlKey };
            drawOverlay(i, i);
          }}
          onPointerMove={(e) => {
            if (!drag.current) return;
            const el = document.elementFromPoint(e.clientX, e.clientY);
            const i = cellAt(el);
            if (i === null || i === drag.current.current) return;
            drag.current.current = i;
            drawOverlay(drag.current.anchor, i);
          }}
          onPointerUp={() => {
            const d = drag.current;
            drag.current = null;
            setOverlay(null);
            if (d) selectIdx(blockOf(d.anchor, d.current), d.add);
          }}
          data-testid="plate-map-grid"
        >
          <button
            type="button"
            className="text-[9px] text-ink-faint hover:text-accent"
            onClick={() =>
              selectIdx(
                map.wells.map((_, i) => i),
                false,
              )
            }
            title="Select all wells"
          >
            all
          </button>
          {Array.from({ length: dims.columns }, (_, c) => (
            <button
              type="button"
              key={`c${c}`}
              className="num text-center text-[9px] leading-4 text-ink-muted hover:text-accent"
              onClick={(e) =>
                selectIdx(
                  Array.from({ length: dims.rows }, (_, r) => r * dims.columns + c),
                  e.shiftKey,
                )
              }
            >
              {c + 1}
            </button>
          ))}
          <Cells
            map={map}
            sel={sel}
            columns={dims.columns}
            rows={dims.rows}
            logMin={logMin}
            logMax={logMax}
            cellText={cellText}
            onRow={(r, add) =>
              selectIdx(
                Array.from({ length: dims.columns }, (_, c) => r * dims.columns + c),
                add,
              )
            }
          />
          {overlay ? (
            <div
              className="pointer-events-none absolute rounded-sm border-2 border-accent bg-accent/10"
              style={overlay}
            />
          ) : null}
        </div>
        <div className="flex flex-wrap gap-3 text-2xs text-ink-soft">
          {WELL_ROLES.map((r) => (
            <span key={r} className="inline-flex items-center gap-1">
              <span
                className={`inline-block h-3 w-3 rounded-sm border border-rule-strong ${roleClass[r]}`}
                style={r === "sample" ? { background: "hsl(174 55% 45%)" } : undefined}
              />
              {roleLabel[r]}: <span className="num">{counts[r]}</span>
            </span>
          ))}
          <span className="text-ink-faint">
            Sample shade: darker = higher inhibitor concentration (log scale)
            {cellText ? "; numbers in wells: inhibitor concentration in µM" : ""}.
          </span>
        </div>
        {issues.length > 0 ? (
          <div className="rounded border border-warn/40 bg-warn-soft px-2 py-1 text-xs text-ink-soft">
            <b className="text-warn">Not ready to save:</b>{" "}
            {issues
              .slice(0, 6)
              .map((i) => i.text)
              .join("; ")}
            {issues.length > 6 ? ` … and ${issues.length - 6} more` : ""}
          </div>
        ) : (
          <p className="text-xs text-pass">
            The plate map is complete: every sample has a compound and a concentration, and there are at least 4 wells
            of each control.
          </p>
        )}
      </div>

      <div className="flex flex-col gap-3">
        {!readOnly ? (
          <>
            <section className="card px-3 py-2">
              <h3 className="mb-2">Assign to selection</h3>
              <div className="grid grid-cols-2 gap-2">
                <label className="col-span-2 text-xs">
                  <span className="field-label">Role</span>
                  <select
                    className="input"
                    value={patch.role}
                    onChange={(e) => setPatch({ ...patch, role: e.target.value as WellRole })}
                    aria-label="Role"
                  >
                    {WELL_ROLES.map((r) => (
                      <option key={r} value={r}>
                        {roleLabel[r]}
                      </option>
                    ))}
                  </select>
                </label>
                <label className="col-span-2 text-xs">
                  <span className="field-label">Compound (registry ID)</span>
                  <input
                    className="input font-mono"
                    placeholder="INH-000123"
                    value={patch.compound}
                    onChange={(e) => setPatch({ ...patch, compound: e.target.value })}
                  />
                </label>
                <label className="text-xs">
                  <span className="field-label">Inhibitor (µM)</span>
                  <input
                    className="input num"
                    inputMode="decimal"
                    value={patch.concentrationUm}
                    onChange={(e) => setPatch({ ...patch, concentrationUm: e.target.value })}
                  />
                </label>
                <label className="text-xs">
                  <span className="field-label">Substrate (µM)</span>
                  <input
                    className="input num"
                    inputMode="decimal"
                    value={patch.substrateUm}
                    onChange={(e) => setPatch({ ...patch, substrateUm: e.target.value })}
                  />
                </label>
                <label className="col-span-2 text-xs">
                  <span className="field-label">Replicate group (optional)</span>
                  <input
                    className="input"
                    value={patch.group}
                    onChange={(e) => setPatch({ ...patch, group: e.target.value })}
                  />
                </label>
              </div>
              <button type="button" className="btn-primary mt-2" onClick={applyAssign}>
                Apply to {sel.size} wells
              </button>
            </section>
            <section className="card px-3 py-2">
              <h3 className="mb-2">Dilution series over the selected block</h3>
              <div className="grid grid-cols-2 gap-2 text-xs">
                <label className="col-span-2">
                  <span className="field-label">Compound (registry ID)</span>
                  <input
                    className="input font-mono"
                    placeholder="INH-000123"
                    value={series.compound}
                    onChange={(e) => setSeries({ ...series, compound: e.target.value })}
                  />
                </label>
                <label>
                  <span className="field-label">Top concentration (µM)</span>
                  <input
                    className="input num"
                    inputMode="decimal"
                    value={series.top}
                    onChange={(e) => setSeries({ ...series, top: e.target.value })}
                  />
                </label>
                <label>
                  <span className="field-label">Dilution</span>
                  <select
                    className="input"
                    value={series.factor}
                    onChange={(e) => setSeries({ ...series, factor: e.target.value })}
                  >
                    <option value="2">1:2</option>
                    <option value="3">1:3</option>
                    <option value="10">1:10</option>
                  </select>
                </label>
                <label>
                  <span className="field-label">Along each</span>
                  <select
                    className="input"
                    value={series.along}
                    onChange={(e) => setSeries({ ...series, along: e.target.value as "row" | "column" })}
                  >
                    <option value="row">row (left → right)</option>
                    <option value="column">column (top → bottom)</option>
                  </select>
                </label>
                <label>
                  <span className="field-label">Highest at</span>
                  <select
                    className="input"
                    value={series.from}
                    onChange={(e) => setSeries({ ...series, from: e.target.value as "from" | "to" })}
                  >
                    <option value="from">first well</option>
                    <option value="to">last well</option>
                  </select>
                </label>
              </div>
              <button type="button" className="btn-quiet mt-2" onClick={applySeries}>
                Fill series
              </button>
            </section>
            {message ? <p className="text-xs text-ink-soft">{message}</p> : null}
          </>
        ) : null}

        <section className="card px-3 py-2">
          <h3 className="mb-2">CSV and templates</h3>
          <div className="flex flex-col gap-2 text-xs">
            {!readOnly ? (
              <label>
                <span className="field-label">Import CSV (well,role,compound,concentration_uM,substrate_uM,group)</span>
                <input
                  type="file"
                  accept=".csv,.tsv,.txt,text/csv"
                  className="block w-full text-xs"
                  aria-label="Import plate map CSV"
                  onChange={(e) => e.target.files?.[0] && importCsv(e.target.files[0])}
                />
              </label>
            ) : null}
            {importIssues.length > 0 ? (
              <ul role="alert" className="list-disc rounded bg-fail-soft py-1 pl-5 pr-2 text-fail">
                {importIssues.slice(0, 12).map((t) => (
                  <li key={t}>{t}</li>
                ))}
              </ul>
            ) : null}
            <div>
              <button type="button" className="btn-quiet" onClick={exportCsv}>
                Export CSV
              </button>
            </div>
            {!readOnly && templates.filter((t) => t.format === format).length > 0 ? (
              <label>
                <span className="field-label">Start from a template</span>
                <select
                  className="input"
                  defaultValue=""
                  onChange={(e) => {
                    const t = templates.find((x) => x.id === e.target.value);
                    if (t) change(plateMapFromWells(format, t.wells));
                  }}
                >
                  <option value="">choose…</option>
                  {templates
                    .filter((t) => t.format === format)
                    .map((t) => (
                      <option key={t.id} value={t.id}>
                        {t.name}
                      </option>
                    ))}
                </select>
              </label>
            ) : null}
          </div>
        </section>

        {!readOnly ? (
          <form action={action} className="card flex flex-col gap-2 px-3 py-2">
            <h3>Save</h3>
            <input type="hidden" name="campaignId" value={campaignId} />
            {mapId && !locked ? <input type="hidden" name="mapId" value={mapId} /> : null}
            <input type="hidden" name="mapJson" value={JSON.stringify({ format, wells: listed })} />
            <label className="text-xs">
              <span className="field-label">Name</span>
              <input
                name="name"
                className="input"
                required
                maxLength={120}
                defaultValue={locked ? `${initial.name} (copy)` : initial.name}
              />
            </label>
            <label className="text-xs">
              <span className="field-label">Signal with inhibition</span>
              <select name="signalDirection" className="input" defaultValue={initial.signalDirection}>
                <option value="falls">falls (product or activity readout)</option>
                <option value="rises">rises (e.g. remaining substrate)</option>
              </select>
            </label>
            <label className="flex items-center gap-2 text-xs">
              <input type="checkbox" name="template" defaultChecked={initial.isTemplate} /> Keep as a template
            </label>
            {locked ? (
              <p className="text-2xs text-ink-muted">
                Plate runs were uploaded against this plate map, so it is kept as it was; saving makes a new plate map.
              </p>
            ) : null}
            <button className="btn-primary" disabled={pending || issues.length > 0}>
              {locked || !mapId ? "Save as a new plate map" : "Save changes"}
            </button>
            <FormMessage state={state} />
          </form>
        ) : (
          <p className="text-xs text-ink-muted">Read-only: assay scientists and administrators edit plate maps.</p>
        )}
      </div>
    </div>
  );
}

const Cells = memo(function Cells({
  map,
  sel,
  columns,
  rows,
  logMin,
  logMax,
  cellText,
  onRow,
}: {
  map: PlateMap;
  sel: Set<number>;
  columns: number;
  rows: number;
  logMin: number;
  logMax: number;
  cellText: boolean;
  onRow: (r: number, add: boolean) => void;
}) {
  const out: React.ReactNode[] = [];
  for (let r = 0; r < rows; r++) {
    out.push(
      <button
        type="button"
        key={`r${r}`}
        className="text-right font-mono text-[9px] leading-none text-ink-muted hover:text-accent"
        onClick={(e) => onRow(r, e.shiftKey)}
      >
        {rowLabel(r)}
      </button>,
    );
    for (let c = 0; c < columns; c++) {
      const i = r * columns + c;
      const w = map.wells[i]!;
      const selected = sel.has(i);
      const title = `${w.well} · ${roleLabel[w.role]}${w.compound ? ` · ${w.compound}` : ""}${w.concentrationUm !== undefined ? ` · ${w.concentrationUm} µM` : ""}${w.substrateUm !== undefined ? ` · S ${w.substrateUm} µM` : ""}${w.group ? ` · group ${w.group}` : ""}`;
      out.push(
        <div
          key={i}
          data-i={i}
          title={title}
          className={`aspect-square rounded-[2px] ${roleClass[w.role]} ${selected ? "outline outline-2 -outline-offset-1 outline-ink" : "border border-rule"} flex items-center justify-center overflow-hidden text-[9px] leading-none`}
          style={w.role === "sample" ? sampleStyle(w.concentrationUm, logMin, logMax) : undefined}
        >
          {cellText && w.role === "sample" && w.concentrationUm !== undefined
            ? Number(w.concentrationUm.toPrecision(2))
            : null}
        </div>,
      );
    }
  }
  return <>{out}</>;
});
