import { plateDimensions, rowLabel, type PlateFormat } from "@/lib/plates/geometry";

/**
 * A plate's signal as a small grid (server-rendered SVG): one cell per well, shaded on a light to
 * dark teal ramp between the plate's lowest and highest signal; wells without a reading, or
 * masked, are blank. For spotting gradients, edge effects and misplaced controls at a glance.
 */
export function BatchHeatmap({
  format,
  values,
  label,
}: {
  format: PlateFormat;
  values: (number | null)[];
  label: string;
}) {
  const { rows, columns } = plateDimensions(format);
  const cell = format === 1536 ? 3 : format === 384 ? 5 : 9;
  let lo = Infinity;
  let hi = -Infinity;
  for (const v of values) {
    if (v === null || v === undefined || !Number.isFinite(v)) continue;
    lo = Math.min(lo, v);
    hi = Math.max(hi, v);
  }
  const span = hi > lo ? hi - lo : 1;
  const shade = (v: number) => {
    const t = (v - lo) / span;
    // from #e3f2ef (accent soft) to #0b5d57 (accent strong)
    const mix = (a: number, b: number) => Math.round(a + (b - a) * t);
    return `rgb(${mix(0xe3, 0x0b)},${mix(0xf2, 0x5d)},${mix(0xef, 0x57)})`;
  };
  const cells = [];
  for (let r = 0; r < rows; r++)
    for (let c = 0; c < columns; c++) {
      const v = values[r * columns + c];
      if (v === null || v === undefined || !Number.isFinite(v)) continue;
      cells.push(<rect key={r * columns + c} x={c * cell} y={r * cell} width={cell} height={cell} fill={shade(v)} />);
    }
  const title = Number.isFinite(lo)
    ? `${label}: signal ${lo.toPrecision(4)} (light) to ${hi.toPrecision(4)} (dark), rows A–${rowLabel(rows - 1)}, columns 1–${columns}`
    : `${label}: no readings`;
  return (
    <svg
      width={columns * cell}
      height={rows * cell}
      viewBox={`0 0 ${columns * cell} ${rows * cell}`}
      role="img"
      aria-label={title}
      className="rounded-sm border border-rule bg-paper-sunk"
    >
      <title>{title}</title>
      {cells}
    </svg>
  );
}
