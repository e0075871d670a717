/** Types for munkres-js (ships none): Hungarian algorithm on a cost matrix, returns [row, column] pairs. */
declare module 'munkres-js' {
  export default function computeMunkres(costMatrix: number[][]): Array<[number, number]>;
}
