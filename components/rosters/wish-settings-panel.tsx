import { useState } from 'react';
import { StyleSheet, View } from 'react-native';
import { TZDate } from '@date-fns/tz';
import { format } from 'date-fns';
import { space } from '@/constants/theme';
import { updateRosterBody } from '@/shared/api/rosters';
import { ApiError } from '@/hooks/api/api-client';
import { useUpdateRoster } from '@/hooks/api/update-roster';
import type { RosterDto } from '@/hooks/api/roster-types';
import { Button } from '@/components/ui/button';
import { DateField } from '@/components/ui/date-field';
import { Notice } from '@/components/ui/notice';
import { TextField } from '@/components/ui/text-field';
import { TimeField } from '@/components/ui/time-field';
import { Body } from '@/components/ui/typography';
import { inZone } from '@/components/staff/format';
import { Panel } from './panel';

const DATE = /^\d{4}-\d{2}-\d{2}$/;
const TIME = /^([01]\d|2[0-3]):[0-5]\d$/;

/** The deadline as the roster's wall clock (date and time), so "Friday 18:00" means 18:00 where the team works. */
const deadlineParts = (r: RosterDto) => (r.wishDeadline ? { date: format(inZone(r.wishDeadline, r.timeZone), 'yyyy-MM-dd'), time: format(inZone(r.wishDeadline, r.timeZone), 'HH:mm') } : { date: '', time: '' });

/** Wish settings of a roster: the staff deadline and the limit on "cannot" days (PATCH /api/rosters/:id). */
export function WishSettingsPanel({ roster }: { roster: RosterDto }) {
  const update = useUpdateRoster();
  const [date, setDate] = useState(deadlineParts(roster).date);
  const [time, setTime] = useState(deadlineParts(roster).time || '18:00');
  const [limit, setLimit] = useState(roster.maxCannotDays === null ? '' : String(roster.maxCannotDays));
  const [errors, setErrors] = useState<{ date?: string; time?: string; limit?: string }>({});
  const save = () => {
    const e: typeof errors = {};
    if (date.trim() && !DATE.test(date.trim())) e.date = 'Enter a date as YYYY-MM-DD';
    if (date.trim() && !TIME.test(time.trim())) e.time = 'Enter a time as HH:mm';
    let wishDeadline: string | null = null;
    if (date.trim() && !e.date && !e.time) {
      const [y, m, d] = date.trim().split('-').map(Number);
      const [hh, mm] = time.trim().split(':').map(Number);
      wishDeadline = new TZDate(y, m - 1, d, hh, mm, roster.timeZone).toISOString();
    }
    const maxCannotDays = limit.trim() === '' ? null : Number(limit.trim());
    const parsed = updateRosterBody.safeParse({ wishDeadline, maxCannotDays, version: roster.version });
    if (!parsed.success) for (const i of parsed.error.issues) if (i.path[0] === 'maxCannotDays') e.limit = 'A whole number from 0 to 366, or blank for no limit';
    setErrors(e);
    if (Object.keys(e).length || !parsed.success) return;
    update.mutate({ id: roster.id, ...parsed.data });
  };
  const conflict = update.error instanceof ApiError && update.error.status === 409;
  const server = update.error instanceof ApiError ? update.error : null;
  return (
    <Panel title="Wish settings" lead={`Staff can state wishes until the deadline (${roster.timeZone} time); after it, only coordinators enter them. Leave the date blank for no deadline.`} testID="wish-settings">
      <View style={styles.row}>
        <DateField label="Deadline day" value={date} onChange={setDate} maxDate={roster.periodEnd} error={errors.date ?? server?.fieldMessage('wishDeadline')} testID="wish-deadline-date" />
        <View style={styles.time}>
          <TimeField label="At" value={time} onChange={setTime} error={errors.time} testID="wish-deadline-time" />
        </View>
      </View>
      <View style={styles.limit}>
        <TextField label="Most “cannot” days a person may mark (blank = no limit)" value={limit} onChangeText={setLimit} inputMode="numeric" error={errors.limit ?? server?.fieldMessage('maxCannotDays')} testID="wish-cannot-limit" />
      </View>
      <Body muted>{roster.wishDeadline ? `Now: wishes close ${format(inZone(roster.wishDeadline, roster.timeZone), "EEEE d MMMM 'at' HH:mm")}.` : 'Now: no deadline.'} {roster.maxCannotDays === null ? 'No limit on “cannot” days.' : `At most ${roster.maxCannotDays} “cannot” day${roster.maxCannotDays === 1 ? '' : 's'} each.`}</Body>
      {conflict ? <Notice kind="caution">{`${update.error!.message} The roster changed since this page loaded; your values are still here, save again to use them.`}</Notice> : update.error && !server?.fieldMessage('wishDeadline') && !server?.fieldMessage('maxCannotDays') ? <Notice>{update.error.message}</Notice> : null}
      {update.isSuccess ? <Notice kind="info">Wish settings saved; staff see them on their Wishes screen.</Notice> : null}
      <View style={styles.save}>
        <Button label="Save wish settings" onPress={save} busy={update.isPending} testID="wish-settings-save" />
      </View>
    </Panel>
  );
}

const styles = StyleSheet.create({
  row: { flexDirection: 'row', flexWrap: 'wrap', gap: space.md, alignItems: 'flex-start' },
  time: { width: 170 },
  limit: { maxWidth: 420 },
  save: { alignSelf: 'flex-start' },
});
