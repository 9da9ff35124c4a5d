// Tests filed, passed and failed per month as grouped bars (plain SVG, no chart package).

export interface MonthBar {
  month: string;
  filed: number;
  passed: number;
  failed: number;
}

const monthNames = ["Jan", "Feb", "Mar", "Apr", "May", "Jun", "Jul", "Aug", "Sep", "Oct", "Nov", "Dec"];
const series = [
  { key: "filed", label: "Filed", color: "#79b9bd" },
  { key: "passed", label: "Passed", color: "#1f7a3d" },
  { key: "failed", label: "Failed (initial test)", color: "#b42318" },
] as const;

/** A round axis maximum with 4 gridlines. */
function niceMax(value: number): number {
  if (value <= 4) return 4;
  const magnitude = 10 ** Math.floor(Math.log10(value));
  for (const step of [1, 2, 2.5, 5, 10]) {
    const max = Math.ceil(value / (step * magnitude)) * step * magnitude;
    if (max / 4 === Math.round(max / 4)) return max;
  }
  return Math.ceil(value / magnitude) * magnitude;
}

export function MonthlyBars({ months, title }: { months: MonthBar[]; title: string }) {
  const width = 760;
  const height = 240;
  const left = 44;
  const right = 8;
  const top = 12;
  const bottom = 40;
  const plotWidth = width - left - right;
  const plotHeight = height - top - bottom;
  const max = niceMax(Math.max(1, ...months.map((m) => m.filed)));
  const slot = plotWidth / Math.max(1, months.length);
  const barWidth = Math.max(2, (slot - 4) / 3);
  const y = (value: number) => top + plotHeight - (value / max) * plotHeight;
  const total = months.reduce((sum, m) => ({ filed: sum.filed + m.filed, passed: sum.passed + m.passed, failed: sum.failed + m.failed }), { filed: 0, passed: 0, failed: 0 });
  return (
    <figure className="w-full">
      <svg viewBox={`0 0 ${width} ${height}`} className="h-auto w-full" role="img" aria-labelledby="monthly-bars-title monthly-bars-desc">
        <title id="monthly-bars-title">{title}</title>
        <desc id="monthly-bars-desc">
          {`Over ${months.length} months: ${total.filed} tests filed, ${total.passed} passed, ${total.failed} failed on the initial test.`}
        </desc>
        {[0, 0.25, 0.5, 0.75, 1].map((f) => (
          <g key={f}>
            <line x1={left} x2={width - right} y1={y(max * f)} y2={y(max * f)} stroke="#d9e0dd" strokeWidth={1} />
            <text x={left - 6} y={y(max * f) + 4} textAnchor="end" fontSize={11} fill="#5b6664">
              {Math.round(max * f).toLocaleString("en-US")}
            </text>
          </g>
        ))}
        {months.map((m, i) => {
          const x0 = left + i * slot + 2;
          const [year, month] = m.month.split("-");
          const isJanuary = month === "01";
          return (
            <g key={m.month}>
              {series.map((s, k) => {
                const value = m[s.key];
                return (
                  <rect key={s.key} x={x0 + k * barWidth} y={y(value)} width={barWidth - 0.5} height={Math.max(0, top + plotHeight - y(value))} fill={s.color}>
                    <title>{`${monthNames[Number(month) - 1]} ${year}: ${value} ${s.label.toLowerCase()}`}</title>
                  </rect>
                );
              })}
              {i % 2 === 0 || months.length <= 12 ? (
                <text x={x0 + slot / 2 - 2} y={top + plotHeight + 14} textAnchor="middle" fontSize={10.5} fill="#5b6664">
                  {monthNames[Number(month) - 1]}
                </text>
              ) : null}
              {isJanuary || i === 0 ? (
                <text x={x0 + slot / 2 - 2} y={top + plotHeight + 28} textAnchor="middle" fontSize={10.5} fontWeight={600} fill="#2f3837">
                  {year}
                </text>
              ) : null}
            </g>
          );
        })}
        <line x1={left} x2={width - right} y1={top + plotHeight} y2={top + plotHeight} stroke="#8a9593" />
      </svg>
      <figcaption className="mt-2 flex flex-wrap gap-4 text-sm text-ink-600">
        {series.map((s) => (
          <span key={s.key} className="inline-flex items-center gap-1.5">
            <span className="inline-block h-3 w-3 rounded-sm" style={{ backgroundColor: s.color }} aria-hidden="true" />
            {s.label}: <span className="font-semibold tabular-nums text-ink-900">{total[s.key].toLocaleString("en-US")}</span>
          </span>
        ))}
      </figcaption>
    </figure>
  );
}
