/**
 * The little of Plotly that Meander uses. plotly.js-dist-min ships no types; this declares the
 * calls we make, with loose trace and layout objects (Plotly validates them at run time).
 */
declare module 'plotly.js-dist-min' {
  export type PlotTrace = Record<string, unknown>;
  export type PlotLayout = Record<string, unknown>;
  export type PlotConfig = Record<string, unknown>;

  export interface DownloadImageOptions {
    format: 'png' | 'svg' | 'jpeg' | 'webp';
    filename: string;
    width?: number;
    height?: number;
    scale?: number;
  }

  export interface PlotlyStatic {
    react(
      element: HTMLElement,
      data: PlotTrace[],
      layout?: PlotLayout,
      config?: PlotConfig,
    ): Promise<HTMLElement>;
    purge(element: HTMLElement): void;
    relayout(element: HTMLElement, update: PlotLayout): Promise<HTMLElement>;
    downloadImage(element: HTMLElement, options: DownloadImageOptions): Promise<string>;
    Plots: { resize(element: HTMLElement): void };
  }

  const Plotly: PlotlyStatic;
  export default Plotly;
}
