// The compliance states as one horizontal stacked bar (plain SVG), each segment linked to its list.

export interface StateSegment {
  key: string;
  label: string;
  count: number;
  color: string;
  href?: string;
}

export function StateBar({ segments, title }: { segments: StateSegment[]; title: string }) {
  const total = segments.reduce((sum, s) => sum + s.count, 0);
  const width = 1000;
  const height = 28;
  let x = 0;
  return (
    <figure>
      <svg viewBox={`0 0 ${width} ${height}`} preserveAspectRatio="none" className="h-7 w-full overflow-hidden rounded" role="img" aria-label={`${title}: ${segments.map((s) => `${s.label} ${s.count}`).join(", ")}`}>
        {total === 0 ? <rect x={0} y={0} width={width} height={height} fill="#e7ebea" /> : null}
        {segments.map((s) => {
          const w = total ? (s.count / total) * width : 0;
          const rect = (
            <rect key={s.key} x={x} y={0} width={w} height={height} fill={s.color}>
              <title>{`${s.label}: ${s.count.toLocaleString("en-US")} (${total ? ((s.count / total) * 100).toFixed(1) : 0}%)`}</title>
            </rect>
          );
          x += w;
          return s.href && w > 0 ? (
            <a key={s.key} href={s.href}>
              {rect}
            </a>
          ) : (
            rect
          );
        })}
      </svg>
    </figure>
  );
}
