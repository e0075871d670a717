/** Copies text with the browser's clipboard; false when the browser refuses (the caller shows the text to copy by hand). */
export async function copyText(text: string): Promise<boolean> {
  try {
    await navigator.clipboard.writeText(text);
    return true;
  } catch {
    return false;
  }
}
