// A stand-in for uPlot in happy-dom (no canvas): the charts mount and update, nothing is drawn.
// Use with `vi.mock('uplot', () => import('./helpers/fake-uplot.ts'))`.
export default class FakePlot {
  width = 600;
  ctx = { canvas: {} };
  setData() {}
  setSize() {}
  destroy() {}
}
