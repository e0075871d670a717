import type { RosterDto, RunDetail } from '@/hooks/api/roster-types';
import { DownloadLink } from '../download-link';
import type { GridModel } from '@/shared/roster/grid-model';

/** Natively there is no print dialog: the PDF made on the server is the printable roster. */
export function PrintButton({ roster, run }: { roster: RosterDto; run: RunDetail; model: GridModel; skillName: (id: number | null) => string }) {
  return <DownloadLink href={`/api/rosters/${roster.id}/roster.pdf?runId=${run.id}`} filename={`${roster.name}.pdf`} label="PDF" a11yLabel="Download the roster grid as a PDF" testID="grid-pdf" />;
}
