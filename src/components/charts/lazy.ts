// The charts as lazy components: uPlot (about 25 kB of gzipped script) loads when a chart is first
// drawn, not with the page, so a page's first script stays small. Render them inside <Suspense>.
import { lazy } from 'react';

export const LazyHeatmap = lazy(() => import('./Heatmap').then((m) => ({ default: m.Heatmap })));
export const LazyLineChart = lazy(() => import('./LineChart').then((m) => ({ default: m.LineChart })));
