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
    const bars = uPlot.paths.bars?.({ size: [0.7 / series.length, 48], align: 0 });
    const xs = labels.map((_, i) => i);
    const data: uPlot.AlignedData = [xs, ...series.map((s) => [...s.values])];
    const plot = new uPlot(
      {
        width: Math.max(320, el.clientWidth || 640),
        height: 240,
        title,
        scales: { x: { time: false, range: [-0.6, labels.length - 0.4] }, y: { range: [0, null] as unknown as uPlot.Range.MinMax } },
        axes: [{ values: (_u, splits) => splits.map((v) => (Number.isInteger(v) ? (labels[v] ?? '') : '')), gap: 4 }, { size: 48 }],
        series: [{}, ...series.map((s) => ({ label: s.name, stroke: s.color, fill: `${s.color}cc`, ...(bars ? { paths: bars } : {}), points: { show: false } }))],
        legend: { show: true },
        cursor: { show: false },
      },
      data,
      el,
    );
    return () => plot.destroy();
  }, [labels, series, title]);
  return <div ref={host} className="chart" aria-hidden="true" />;
}
