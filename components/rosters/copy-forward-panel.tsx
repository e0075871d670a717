import { useState } from 'react';
import { Link } from 'expo-router';
import { StyleSheet, View } from 'react-native';
import { colors, fonts, space } from '@/constants/theme';
import { copyForwardBody } from '@/shared/api/copy-forward';
import { addLocalDays, daysBetween } from '@/shared/roster/time';
import { localDateSchema } from '@/shared/roster/schema';
import { useCopyForward } from '@/hooks/api/copy-forward';
import type { RosterDto } from '@/hooks/api/roster-types';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { TextField } from '@/components/ui/text-field';
import { DateField } from '@/components/ui/date-field';
import { Body } from '@/components/ui/typography';
import { isBillingRefusal, PlanLimitPrompt } from '@/components/billing/plan-limit-prompt';
import { checkForm, fieldError, formError, type FieldErrors } from '@/components/forms/form-errors';
import { Panel } from './panel';
import { periodWords } from './format';

const plural = (n: number, one: string, many = `${one}s`) => `${n} ${n === 1 ? one : many}`;

/** Next period's roster from this one: the first day picked, the length and set-up kept. */
export function CopyForwardPanel({ roster, onClose }: { roster: RosterDto; onClose: () => void }) {
  const copy = useCopyForward();
  const [name, setName] = useState(`${roster.name} (next)`);
  const [start, setStart] = useState(addLocalDays(roster.periodEnd, 1));
  const [errors, setErrors] = useState<FieldErrors>({});
  const length = daysBetween(roster.periodStart, roster.periodEnd);
  const end = localDateSchema.safeParse(start).success ? addLocalDays(start, length) : null;
  const submit = () => {
    const checked = checkForm(copyForwardBody, { name, periodStart: start });
    setErrors(checked.errors ?? {});
    if (checked.data) copy.mutate({ rosterId: roster.id, ...checked.data });
  };
  const done = copy.data;
  return (
    <Panel title="Copy forward" lead="A new roster for a later period, set up like this one: its shift patterns and hand-added shifts, rules and wish settings. Wishes stay with this roster; time away and terms belong to each person and apply by their dates." testID="copy-forward">
      {done ? (
        <View style={{ gap: space.sm }} testID="copy-forward-done" role="status">
          <Notice kind="info">{`“${done.roster.name}” made for ${periodWords(done.roster.periodStart, done.roster.periodEnd)}.`}</Notice>
          <Body>{`Copied: ${plural(done.copied.patterns, 'shift pattern')} (${plural(done.copied.shiftsFromPatterns, 'shift')} over the new period)${done.copied.handShifts ? `, ${plural(done.copied.handShifts, 'hand-added shift')} moved ${plural(done.shiftedByDays, 'day')}` : ''}, the rules.`}</Body>
          <Body muted>{`Apply as before: terms of ${plural(done.inForce.peopleWithTerms, 'person', 'people')}, ${plural(done.inForce.pairings, 'pairing')}. Not copied: ${plural(done.leftBehind.wishes, 'wish', 'wishes')}.`}</Body>
          <View style={styles.row}>
            <Link href={`/rosters/${done.roster.id}`} onPress={onClose} style={styles.link} testID="copy-forward-open">{`Open ${done.roster.name}`}</Link>
            <Button kind="quiet" label="Close" onPress={onClose} />
          </View>
        </View>
      ) : (
        <>
          <TextField label="Name of the new roster" value={name} onChangeText={setName} error={fieldError(errors, copy.error, 'name')} testID="copy-forward-name" />
          <DateField label="Its first day" value={start} onChange={setStart} minDate={addLocalDays(roster.periodStart, 1)} error={fieldError(errors, copy.error, 'periodStart')} testID="copy-forward-start" />
          <Body muted testID="copy-forward-period">{end ? `Runs ${periodWords(start, end)}: ${plural(length + 1, 'day')}, like this one, in ${roster.timeZone}.` : 'Pick the first day; the new roster is as long as this one.'}</Body>
          {isBillingRefusal(copy.error) ? <PlanLimitPrompt error={copy.error} /> : formError(copy.error, ['name', 'periodStart']) ? <Notice>{formError(copy.error, ['name', 'periodStart'])!}</Notice> : null}
          <View style={styles.row}>
            <Button label="Make the new roster" onPress={submit} busy={copy.isPending} testID="copy-forward-go" />
            <Button kind="quiet" label="Not now" onPress={onClose} />
          </View>
        </>
      )}
    </Panel>
  );
}

const styles = StyleSheet.create({
  row: { flexDirection: 'row', flexWrap: 'wrap', alignItems: 'center', gap: space.md },
  link: { color: colors.loom, fontFamily: fonts.bodyBold, fontSize: 16, paddingVertical: space.sm },
});
