import { useEffect, useRef, useState } from 'react';
import { NARROW_FIGURE_PX } from '../../../../shared/plots/forest';
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

/** The figure's layout for a box this wide: its `narrow` variant below NARROW_FIGURE_PX, when it has one. */
export function figureForWidth(figure: Figure, width: number): Figure {
  return figure.narrow && width > 0 && width < NARROW_FIGURE_PX ? figure.narrow : figure;
}

/**
 * Draws a figure built in shared/plots (the live page and a snapshot use the same builders), with SVG
 * and PNG downloads. `show` overrides the visibility of traces by their `meta` tag. The page names the figure
 * (its caption): the layout's title is drawn only in the downloaded files.
 */
export function PlotFigure({ figure, name, label, show }: { figure: Figure; name: string; label: string; show?: Record<string, boolean> }) {
  const ref = useRef<HTMLDivElement>(null);
  const [state, setState] = useState<'loading' | 'drawn' | 'failed'>('loading');
  const [error, setError] = useState<unknown>(null);
  const [narrow, setNarrow] = useState(false);
  const shown = narrow && figure.narrow ? figure.narrow : figure;

  useEffect(() => {
    const el = ref.current;
    if (!el || !figure.narrow) return;
    const measure = () => setNarrow(figureForWidth(figure, el.clientWidth) !== figure);
    measure();
    const watch = new ResizeObserver(measure);
    watch.observe(el);
    return () => watch.disconnect();
  }, [figure]);

  useEffect(() => {
    let cancelled = false;
    const el = ref.current;
    if (!el) return;
    const data = shown.data.map((t) => (show && typeof t.meta === 'string' && t.meta in show ? { ...t, visible: show[t.meta] } : t));
    const { title: _title, ...layout } = shown.layout;
    const top = (layout.margin as { t?: number } | undefined)?.t;
    loadPlotly()
      .then((Plotly) => (cancelled ? null : Plotly.react(el, data, { ...layout, margin: { ...(layout.margin as object), t: top ?? 24 }, autosize: true }, CONFIG)))
      .then(() => !cancelled && setState('drawn'))
      .catch((err) => {
        if (cancelled) return;
        setError(err);
        setState('failed');
      });
    return () => {
      cancelled = true;
    };
  }, [shown, show]);

  useEffect(() => {
    const el = ref.current;
    return () => {
      if (el) void loadPlotly().then((Plotly) => Plotly.purge(el)).catch(() => undefined);
    };
  }, []);

  const download = async (format: 'svg' | 'png') => {
    const Plotly = await loadPlotly();
    if (!ref.current) return;
    // the file carries the title the screen leaves to the caption: the drawn traces with the figure's own layout
    const gd = ref.current as unknown as { data: unknown[] };
    const height = Number(shown.layout.height) || 500;
    const titled = { data: gd.data, layout: { ...shown.layout, margin: { ...(shown.layout.margin as object), t: Number((shown.layout.margin as { t?: number })?.t ?? 24) + 28 }, height: height + 28 } };
    await Plotly.downloadImage(titled as never, { format, filename: name, width: ref.current.clientWidth || 1000, height: height + 28, scale: format === 'png' ? 2 : 1 });
  };

  return (
    <figure className="my-3 rounded border border-paper-edge bg-paper" aria-label={label}>
      {state === 'loading' && (
        <p role="status" className="px-3 py-2 text-sm text-ink-faint">
          ◌ Drawing the {label.toLowerCase()}…
        </p>
      )}
      {state === 'failed' && <ErrorNote error={error} title={`The ${label.toLowerCase()} could not be drawn`} />}
      <div ref={ref} data-plot={name} className="w-full" style={{ minHeight: state === 'drawn' ? undefined : Number(shown.layout.height) || 300 }} />
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
