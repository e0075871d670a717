// The one chart the app draws, as its own module so the chunk bar-chart.tsx imports keeps only
// what BarChart needs (tree shaking works on named exports; import() of the package would keep all
// of gifted-charts: line, pie, bubble and radar charts too, 363 KiB minified).
export { BarChart } from 'react-native-gifted-charts';
