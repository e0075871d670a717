import type { ReactNode } from 'react';
import { ScrollView, View, type GestureResponderEvent } from 'react-native';

interface Props {
  children: ReactNode;
  onScrollX: (x: number) => void;
  onTouchStart: (e: GestureResponderEvent) => void;
  onTouchEnd: (e: GestureResponderEvent) => void;
  testID?: string;
}

/** Natively the grid scrolls sideways in a ScrollView (the page scrolls it down). */
export function GridScroller({ children, onScrollX, onTouchStart, onTouchEnd, testID }: Props) {
  return (
    <View onTouchStart={onTouchStart} onTouchEnd={onTouchEnd} testID={testID}>
      <ScrollView horizontal onScroll={(e) => onScrollX(e.nativeEvent.contentOffset.x)} scrollEventThrottle={32}>
        {children}
      </ScrollView>
    </View>
  );
}
