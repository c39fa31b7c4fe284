import { useEffect, useRef, useState } from 'react';
import type { PlotFigure as Figure } from '../../../../shared/synthesis/types';
import { Button } from '../../../components/ui/Button';
import { ErrorNote } from '../../../components/ui/Notice';
import { loadPlotly } from '../load-plotly';

const CONFIG = {
  displaylogo: false,
  responsive: true,
  displayModeBar: false,
  scrollZoom: false,
};

/**
 * Draws a figure built in shared/plots (the live page and a snapshot use the same builders), with SVG
 * and PNG downloads. `show` overrides the visibility of traces by their `meta` tag.
 */
export function PlotFigure({ figure, name, label, show }: { figure: Figure; name: string; label: string; show?: Record<string, boolean> }) {
  const ref = useRef<HTMLDivElement>(null);
  const [state, setState] = useState<'loading' | 'drawn' | 'failed'>('loading');
  const [error, setError] = useState<unknown>(null);

  useEffect(() => {
    let cancelled = false;
    const el = ref.current;
    if (!el) return;
    const data = figure.data.map((t) => (show && typeof t.meta === 'string' && t.meta in show ? { ...t, visible: show[t.meta] } : t));
    loadPlotly()
      .then((Plotly) => (cancelled ? null : Plotly.react(el, data, { ...figure.layout, autosize: true }, CONFIG)))
      .then(() => !cancelled && setState('drawn'))
      .catch((err) => {
        if (cancelled) return;
        setError(err);
        setState('failed');
      });
    return () => {
      cancelled = true;
    };
  }, [figure, show]);

  useEffect(() => {
    const el = ref.current;
    return () => {
      if (el) void loadPlotly().then((Plotly) => Plotly.purge(el)).catch(() => undefined);
    };
  }, []);

  const download = async (format: 'svg' | 'png') => {
    const Plotly = await loadPlotly();
    if (!ref.current) return;
    await Plotly.downloadImage(ref.current, { format, filename: name, width: ref.current.clientWidth || 1000, height: Number(figure.layout.height) || 500, scale: format === 'png' ? 2 : 1 });
  };

  return (
    <figure className="my-3 rounded border border-paper-edge bg-paper" aria-label={label}>
      {state === 'loading' && (
        <p role="status" className="px-3 py-2 text-sm text-ink-faint">
          ◌ Drawing the {label.toLowerCase()}…
        </p>
      )}
      {state === 'failed' && <ErrorNote error={error} title={`The ${label.toLowerCase()} could not be drawn`} />}
      <div ref={ref} data-plot={name} className="w-full" style={{ minHeight: state === 'drawn' ? undefined : Number(figure.layout.height) || 300 }} />
      <figcaption className="flex flex-wrap items-center gap-2 border-t border-paper-edge px-3 py-1.5 text-xs text-ink-soft">
        <span className="mr-auto">{label}</span>
        <Button onClick={() => void download('svg')} disabled={state !== 'drawn'} aria-label={`Download the ${label.toLowerCase()} as SVG`}>
          ↓ SVG
        </Button>
        <Button onClick={() => void download('png')} disabled={state !== 'drawn'} aria-label={`Download the ${label.toLowerCase()} as PNG`}>
          ↓ PNG
        </Button>
      </figcaption>
    </figure>
  );
}
