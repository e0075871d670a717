import { Body } from '@/components/ui/typography';

/** Downloads are a browser feature; the app on a phone points there. */
export function ExportLink() {
  return <Body muted>Export the people list as CSV from Rotaloom in a web browser.</Body>;
}
