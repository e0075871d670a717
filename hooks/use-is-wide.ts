import { useWindowDimensions } from 'react-native';
import { WIDE_BREAKPOINT } from '@/constants/theme';

export const useIsWide = () => useWindowDimensions().width >= WIDE_BREAKPOINT;
