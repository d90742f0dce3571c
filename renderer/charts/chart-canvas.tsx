// A chart.js chart as a Preact component: built on mount, rebuilt when its config changes,
// destroyed on unmount. The canvas carries a text description for screen readers.
import { useEffect, useRef } from 'preact/hooks';
import {
  BarController,
  BarElement,
  CategoryScale,
  Chart,
  Filler,
  Legend,
  LinearScale,
  LineController,
  LineElement,
  PointElement,
  ScatterController,
  Tooltip,
  type ChartConfiguration,
} from 'chart.js';

Chart.register(LineController, LineElement, PointElement, LinearScale, CategoryScale, BarController, BarElement, ScatterController, Filler, Legend, Tooltip);

export interface ChartCanvasProps {
  readonly config: ChartConfiguration;
  /** What the chart shows, in words, for people who cannot see it. */
  readonly description: string;
  readonly testId?: string;
  readonly height?: number;
}

export function ChartCanvas({ config, description, testId, height = 260 }: ChartCanvasProps) {
  const canvas = useRef<HTMLCanvasElement>(null);
  useEffect(() => {
    if (!canvas.current) return undefined;
    const chart = new Chart(canvas.current, config);
    return () => chart.destroy();
  }, [config]);
  return (
    <div class="chart-box" style={{ height: `${height}px` }}>
      <canvas ref={canvas} role="img" aria-label={description} data-testid={testId}>
        {description}
      </canvas>
    </div>
  );
}
