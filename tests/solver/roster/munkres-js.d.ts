// munkres-js ships no types: Kuhn–Munkres on a cost matrix, returns [row, column] pairs of a minimum-cost assignment.
declare module 'munkres-js' {
  function computeMunkres(costMatrix: number[][]): Array<[number, number]>;
  export default computeMunkres;
}
