/** On the web the payment pages open in the same tab; they send the browser back to /billing. */
export function openExternal(url: string): void {
  window.location.assign(url);
}
