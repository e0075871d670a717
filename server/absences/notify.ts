import { Person, User, Workspace } from '../db/models';
import type { Mailer } from '../mail/mailer';
import { absenceDecisionMail } from '../mail/templates';
import type { AbsenceDto } from '../../shared/api/absences';
import { describeAbsence } from './repository';

export interface DecisionMailReport {
  /** null: the person has no address of their own and no linked login, so nobody was told. */
  to: string | null;
  sent: boolean;
  error?: string;
}

/**
 * Tells the person about a decision, at their own address or their linked account's. A mail that
 * fails is reported back; the decision stands either way (it is already saved).
 */
export async function mailDecision(workspaceId: number, a: AbsenceDto, deps: { mailer: Mailer; publicUrl: string }): Promise<DecisionMailReport> {
  const person = await Person.findOne({ where: { id: a.personId, workspaceId } });
  const user = person?.userId ? await User.findByPk(person.userId) : null;
  const to = person?.email ?? user?.email ?? null;
  if (!person || !to) return { to: null, sent: false };
  const workspace = await Workspace.findByPk(workspaceId);
  try {
    await deps.mailer.send(
      absenceDecisionMail({
        to,
        name: person.name,
        workspaceName: workspace?.name ?? 'your workspace',
        approved: a.status === 'approved',
        what: describeAbsence(a),
        reason: a.declineReason,
        decidedBy: a.decidedByName,
        url: `${deps.publicUrl}/my-shifts`,
      }),
    );
    return { to, sent: true };
  } catch (err) {
    return { to, sent: false, error: err instanceof Error ? err.message : String(err) };
  }
}
