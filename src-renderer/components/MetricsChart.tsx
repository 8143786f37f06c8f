import { useEffect, useRef } from 'react';
import uPlot from 'uplot';
import 'uplot/dist/uPlot.min.css';

export interface MetricsChartProps {
  /** One label per bar group (models and baselines, best first). */
  labels: readonly string[];
  series: readonly { name: string; values: readonly (number | null)[]; color: string }[];
  title: string;
}

/**
 * Grouped bars drawn by uPlot on a canvas. The chart is a picture of the table beside it, which holds the
 * same numbers for keyboards and screen readers; so the canvas is hidden from assistive technology.
 */
export function MetricsChart({ labels, series, title }: MetricsChartProps) {
  const host = useRef<HTMLDivElement>(null);
  useEffect(() => {
    const el = host.current;
    if (!el || labels.length === 0) return;
    // Grouped bars: series s of group g sits at g + (s - (S-1)/2)·w, so the groups' bars stand side by side
    // instead of on top of each other; each series has values only at its own positions (null elsewhere).
    const n = series.length;
    const w = 0.8 / n;
    const xs: number[] = [];
    labels.forEach((_, g) => series.forEach((_s, k) => xs.push(g + (k - (n - 1) / 2) * w)));
    const column = (k: number) => xs.map((_, j) => (j % n === k ? (series[k]!.values[Math.floor(j / n)] ?? null) : null));
    const bars = uPlot.paths.bars?.({ size: [0.9, 64], align: 0 });
    const data: uPlot.AlignedData = [xs, ...series.map((_s, k) => column(k))];
    const plot = new uPlot(
      {
        width: Math.max(320, el.clientWidth || 640),
        height: 240,
        title,
        scales: { x: { time: false, range: [-0.6, labels.length - 0.4] }, y: { range: [0, null] as unknown as uPlot.Range.MinMax } },
        axes: [{ splits: () => labels.map((_, i) => i), values: (_u, splits) => splits.map((v) => labels[Math.round(v)] ?? ''), gap: 4 }, { size: 48 }],
        series: [
          { label: 'Model' },
          ...series.map((s) => ({ label: s.name, stroke: s.color, fill: `${s.color}cc`, spanGaps: false, ...(bars ? { paths: bars } : {}), points: { show: false } })),
        ],
        legend: { show: true, live: false },
        cursor: { show: false },
      },
      data,
      el,
    );
    // The chart follows its panel's width (it kept the width it was drawn at, and overflowed a narrowed window).
    const resize = typeof ResizeObserver === 'undefined' ? null : new ResizeObserver(() => plot.setSize({ width: Math.max(320, el.clientWidth || 640), height: 240 }));
    resize?.observe(el);
    return () => {
      resize?.disconnect();
      plot.destroy();
    };
  }, [labels, series, title]);
  return <div ref={host} className="chart" aria-hidden="true" />;
}
