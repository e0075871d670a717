import type { ViewStyle } from 'react-native';

// react-native-web passes these through to CSS: the header row and the name column stay in place
// while the grid's own box scrolls both ways (React Native's types know neither value).
export const stickyTop = { position: 'sticky', top: 0, zIndex: 2 } as unknown as ViewStyle;
export const stickyLeft = { position: 'sticky', left: 0, zIndex: 1 } as unknown as ViewStyle;
export const stickyCorner = { position: 'sticky', top: 0, left: 0, zIndex: 3 } as unknown as ViewStyle;
