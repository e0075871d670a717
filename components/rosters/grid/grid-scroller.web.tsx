import { createElement, type ReactNode } from 'react';
import type { GestureResponderEvent } from 'react-native';
import { colors, radius } from '@/constants/theme';

interface Props {
  children: ReactNode;
  onScrollX: (x: number) => void;
  onTouchStart: (e: GestureResponderEvent) => void;
  onTouchEnd: (e: GestureResponderEvent) => void;
  testID?: string;
}

/**
 * One box that scrolls both ways, so CSS sticky can pin the header row (top) and the name column
 * (left) to it; a ScrollView inside would become the sticky parent and the header would scroll away.
 */
export function GridScroller({ children, onScrollX, onTouchStart, onTouchEnd, testID }: Props) {
  const touches = (e: TouchEvent, list: 'touches' | 'changedTouches') => ({ nativeEvent: { [list]: [...Array.from(e[list]).map((t) => ({ pageX: t.pageX, pageY: t.pageY }))], pageX: 0, pageY: 0 } }) as unknown as GestureResponderEvent;
  return createElement(
    'div',
    {
      'data-testid': testID,
      tabIndex: 0,
      role: 'region',
      'aria-label': 'Roster grid, scrolls both ways',
      onScroll: (e: { currentTarget: HTMLDivElement }) => onScrollX(e.currentTarget.scrollLeft),
      onTouchStart: (e: { nativeEvent: TouchEvent }) => onTouchStart(touches(e.nativeEvent, 'touches')),
      onTouchEnd: (e: { nativeEvent: TouchEvent }) => onTouchEnd(touches(e.nativeEvent, 'changedTouches')),
      style: { overflow: 'auto', maxHeight: '75vh', border: `1px solid ${colors.line}`, borderRadius: radius.sm, background: colors.white, overscrollBehaviorX: 'contain' },
    },
    children,
  );
}
