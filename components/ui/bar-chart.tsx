import { lazy, Suspense, type ComponentProps } from 'react';
import { ActivityIndicator } from 'react-native';
import type { BarChart as GiftedBarChart } from 'react-native-gifted-charts';
import { colors } from '@/constants/theme';

// react-native-gifted-charts with react-native-svg is ~170 KB minified. Imported statically by
// the two ledger screens it would land in the __common chunk that every first screen loads (the
// landing page too); behind import() it is a chunk of its own. Asked for as soon as a screen
// that draws charts is loaded, so it arrives beside that screen's data rather than after it.
const loading = import('./bar-chart-impl');
// Failing offline is answered where a chart is drawn (lazy rethrows it), not as an unhandled rejection.
loading.catch(() => {});
const Chart = lazy(() => loading.then((m) => ({ default: m.BarChart })));

/** gifted-charts' bar chart, its code fetched when a screen with charts is first opened. */
export function BarChart(props: ComponentProps<typeof GiftedBarChart>) {
  return (
    <Suspense fallback={<ActivityIndicator color={colors.loom} accessibilityLabel="Loading the chart" />}>
      <Chart {...props} />
    </Suspense>
  );
}
