import { Notice } from '@/components/ui/notice';

/** Phones have no file chooser we can use here without another package; imports happen in a browser. */
export function CsvPicker(_props: { onPick: (file: Blob & { name?: string }) => void; disabled?: boolean; label?: string }) {
  return <Notice kind="info">Importing a CSV file works in a web browser: open Rotaloom on a computer and go to People → Import CSV.</Notice>;
}
