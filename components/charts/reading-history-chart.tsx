// One differential reading over the years: a point per test, the minimum as a dashed line.
// Plain SVG; every point has a tooltip and the figures are repeated in a table for screen readers.

export interface ReadingPoint {
  reportId: number;
  testedOn: string;
  /** null = the valve did not open. */
  value: number | null;
  phase: "initial" | "retest";
  isCounted: boolean;
}

export interface ReadingHistoryChartProps {
  label: string;
  unit: string;
  minimum: number | null;
  points: ReadingPoint[];
  /** The report being reviewed, drawn larger. */
  highlightReportId?: number;
}

const colors = { pass: "#1f7a3d", fail: "#b42318", muted: "#8a9593", line: "#47979d", minimum: "#a15c00" };

function dayNumber(date: string): number {
  return Date.parse(`${date}T00:00:00Z`) / 86_400_000;
}

export function ReadingHistoryChart({ label, unit, minimum, points, highlightReportId }: ReadingHistoryChartProps) {
  const width = 340;
  const height = 150;
  const left = 34;
  const right = 10;
  const top = 12;
  const bottom = 24;
  const plotWidth = width - left - right;
  const plotHeight = height - top - bottom;
  const values = points.map((p) => p.value ?? 0);
  const maxValue = Math.max(minimum ?? 0, ...values, 1);
  const yMax = Math.ceil(maxValue * 1.2);
  const days = points.map((p) => dayNumber(p.testedOn));
  let first = Math.min(...days);
  let last = Math.max(...days);
  if (last - first < 180) {
    first -= 90;
    last += 90;
  }
  const x = (date: string) => left + ((dayNumber(date) - first) / (last - first)) * plotWidth;
  const y = (value: number) => top + plotHeight - (value / yMax) * plotHeight;
  const years: number[] = [];
  for (let year = new Date(first * 86_400_000).getUTCFullYear() + 1; year <= new Date(last * 86_400_000).getUTCFullYear(); year++) years.push(year);
  const counted = points.filter((p) => p.isCounted && p.phase === "initial" && p.value !== null);
  const path = counted.map((p, i) => `${i === 0 ? "M" : "L"}${x(p.testedOn).toFixed(1)},${y(p.value!).toFixed(1)}`).join(" ");
  const isBelow = (p: ReadingPoint) => p.value === null || (minimum !== null && p.value < minimum - 1e-9);
  const titleId = `chart-${label.replace(/[^a-z0-9]+/gi, "-").toLowerCase()}`;
  return (
    <figure className="rounded-md border border-ink-100 bg-white p-3">
      <figcaption className="mb-1 flex items-baseline justify-between gap-2 text-sm">
        <span id={titleId} className="font-semibold text-ink-800">
          {label}
        </span>
        {minimum !== null ? (
          <span className="text-xs text-caution-700">
            minimum {minimum.toFixed(1)} {unit}
          </span>
        ) : null}
      </figcaption>
      <svg viewBox={`0 0 ${width} ${height}`} className="h-auto w-full" role="img" aria-labelledby={titleId}>
        {[0, 0.5, 1].map((f) => (
          <g key={f}>
            <line x1={left} x2={width - right} y1={y(yMax * f)} y2={y(yMax * f)} stroke="#e7ebea" />
            <text x={left - 5} y={y(yMax * f) + 3.5} textAnchor="end" fontSize={10} fill="#5b6664">
              {(yMax * f).toFixed(yMax < 5 ? 1 : 0)}
            </text>
          </g>
        ))}
        {years.map((year) => {
          const at = x(`${year}-01-01`);
          return (
            <g key={year}>
              <line x1={at} x2={at} y1={top} y2={top + plotHeight} stroke="#e7ebea" />
              <text x={at} y={height - 8} textAnchor="middle" fontSize={10} fill="#5b6664">
                {year}
              </text>
            </g>
          );
        })}
        {minimum !== null ? <line x1={left} x2={width - right} y1={y(minimum)} y2={y(minimum)} stroke={colors.minimum} strokeDasharray="5 3" strokeWidth={1.2} /> : null}
        {path ? <path d={path} fill="none" stroke={colors.line} strokeWidth={1.5} /> : null}
        {points.map((p) => {
          const cx = x(p.testedOn);
          const cy = y(p.value ?? 0);
          const color = !p.isCounted ? colors.muted : isBelow(p) ? colors.fail : colors.pass;
          const isHighlighted = p.reportId === highlightReportId;
          const r = isHighlighted ? 5.5 : 3.5;
          const text = `${p.testedOn} ${p.phase === "retest" ? "retest" : "as found"}: ${p.value === null ? "did not open" : `${p.value.toFixed(1)} ${unit}`}${p.isCounted ? "" : " (report not counted)"}`;
          return p.phase === "retest" ? (
            <rect key={`${p.reportId}-${p.phase}`} x={cx - r} y={cy - r} width={r * 2} height={r * 2} transform={`rotate(45 ${cx} ${cy})`} fill="#ffffff" stroke={color} strokeWidth={1.8}>
              <title>{text}</title>
            </rect>
          ) : (
            <circle key={`${p.reportId}-${p.phase}`} cx={cx} cy={cy} r={r} fill={color} stroke={isHighlighted ? "#1c2423" : "#ffffff"} strokeWidth={isHighlighted ? 1.5 : 1}>
              <title>{text}</title>
            </circle>
          );
        })}
        <line x1={left} x2={width - right} y1={top + plotHeight} y2={top + plotHeight} stroke="#8a9593" />
      </svg>
      <table className="sr-only">
        <caption>{label}</caption>
        <thead>
          <tr>
            <th>Test date</th>
            <th>Phase</th>
            <th>Reading ({unit})</th>
          </tr>
        </thead>
        <tbody>
          {points.map((p) => (
            <tr key={`${p.reportId}-${p.phase}`}>
              <td>{p.testedOn}</td>
              <td>{p.phase === "retest" ? "retest after repair" : "as found"}</td>
              <td>{p.value === null ? "did not open" : p.value.toFixed(1)}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </figure>
  );
}

export function ReadingChartLegend() {
  return (
    <p className="flex flex-wrap gap-x-4 gap-y-1 text-xs text-ink-600">
      <span className="inline-flex items-center gap-1">
        <span className="inline-block h-2.5 w-2.5 rounded-full" style={{ backgroundColor: colors.pass }} aria-hidden="true" /> at or above the minimum
      </span>
      <span className="inline-flex items-center gap-1">
        <span className="inline-block h-2.5 w-2.5 rounded-full" style={{ backgroundColor: colors.fail }} aria-hidden="true" /> below it, or did not open
      </span>
      <span className="inline-flex items-center gap-1">
        <span className="inline-block h-2.5 w-2.5 rotate-45 border-2 bg-white" style={{ borderColor: colors.pass }} aria-hidden="true" /> retest after repair
      </span>
      <span className="inline-flex items-center gap-1">
        <span className="inline-block h-2.5 w-2.5 rounded-full" style={{ backgroundColor: colors.muted }} aria-hidden="true" /> returned or replaced report
      </span>
      <span className="inline-flex items-center gap-1">
        <span className="inline-block w-4 border-t-2 border-dashed" style={{ borderColor: colors.minimum }} aria-hidden="true" /> minimum now in force
      </span>
    </p>
  );
}
