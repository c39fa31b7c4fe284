declare module 'plotly.js-dist-min' {
  type Gd = HTMLElement;
  interface ImageOptions {
    format: 'svg' | 'png';
    width?: number;
    height?: number;
    filename?: string;
    scale?: number;
  }
  const Plotly: {
    newPlot(gd: Gd, data: unknown[], layout?: Record<string, unknown>, config?: Record<string, unknown>): Promise<Gd>;
    react(gd: Gd, data: unknown[], layout?: Record<string, unknown>, config?: Record<string, unknown>): Promise<Gd>;
    purge(gd: Gd): void;
    downloadImage(gd: Gd, opts: ImageOptions): Promise<string>;
  };
  export default Plotly;
}
