import type { TopLevelSpec } from 'vega-lite';

/** A chart to draw: its Vega-Lite spec, a heading and a caption saying what is shown and how it was thinned. */
export interface ChartSpec {
  /** Short machine name, unique within a run (e.g. 'angle'). */
  id: string;
  title: string;
  caption: string;
  spec: TopLevelSpec;
}
