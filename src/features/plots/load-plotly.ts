type PlotlyModule = typeof import('plotly.js-dist-min').default;

let loading: Promise<PlotlyModule> | null = null;

/** Plotly is ~4.6 MB: fetched on first use, in its own chunk, never in the first page. */
export function loadPlotly(): Promise<PlotlyModule> {
  loading ??= import('plotly.js-dist-min').then((m) => (m as { default: PlotlyModule }).default ?? (m as unknown as PlotlyModule));
  loading.catch(() => {
    loading = null;
  });
  return loading;
}
