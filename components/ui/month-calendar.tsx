import { lazy, Suspense, type ComponentProps } from 'react';
import { ActivityIndicator } from 'react-native';
import type { Calendar as CalendarType } from 'react-native-calendars';
import { colors } from '@/constants/theme';

// react-native-calendars brings lodash, moment and a list recycler (~330 KB): loaded only when a month is shown.
const Calendar = lazy(() => import('react-native-calendars').then((m) => ({ default: m.Calendar })));

/** react-native-calendars' month view, fetched the first time one is drawn. */
export function MonthCalendar(props: ComponentProps<typeof CalendarType>) {
  return (
    <Suspense fallback={<ActivityIndicator color={colors.loom} accessibilityLabel="Loading the calendar" />}>
      <Calendar {...props} />
    </Suspense>
  );
}
