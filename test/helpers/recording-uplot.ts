// A stand-in for uPlot in happy-dom (no canvas) that records what each chart would draw, by the
// chart's `data-chart` id. Use with `vi.mock('uplot', () => import('./helpers/recording-uplot.ts'))`
// and import `drawn` from this module in the test.
export const drawn: { id: string; data: unknown[] }[] = [];

export default class FakePlot {
  width: number;
  ctx = { canvas: {} };
  hooks: { draw: (() => void)[] };
  el: HTMLElement;
  constructor(opts: { width: number; hooks: { draw: (() => void)[] } }, data: unknown[], el: HTMLElement) {
    this.width = opts.width;
    this.hooks = opts.hooks;
    this.el = el;
    this.setData(data);
  }
  setData(data: unknown[]) {
    drawn.push({ id: this.el.dataset.chart ?? '', data });
    for (const h of this.hooks.draw) h();
  }
  /** uPlot draws a batch at once rather than in a microtask: here every draw is at once anyway. */
  batch(fn: (self: FakePlot) => void) {
    fn(this);
  }
  setSize() {}
  destroy() {}
  static join() {
    return [];
  }
}
