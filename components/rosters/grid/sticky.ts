import type { ViewStyle } from 'react-native';

/** Native scroll views cannot pin a row and a column at once; there the grid scrolls whole. */
export const stickyTop: ViewStyle = {};
export const stickyLeft: ViewStyle = {};
export const stickyCorner: ViewStyle = {};
