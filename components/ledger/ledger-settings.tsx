import { useEffect, useState } from 'react';
import { View } from 'react-native';
import { space } from '@/constants/theme';
import { useLedgerSettings } from '@/hooks/api/get-ledger-settings';
import { usePutLedgerSettings } from '@/hooks/api/put-ledger-settings';
import { useAddHoliday } from '@/hooks/api/add-holiday';
import { useDeleteHoliday } from '@/hooks/api/delete-holiday';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { TextField } from '@/components/ui/text-field';
import { Body } from '@/components/ui/typography';
import { plainDay } from '@/components/staff/format';

/** Where public holidays come from, the weights the next roster gives the ledger, and days entered by hand. */
export function LedgerSettings() {
  const settings = useLedgerSettings();
  const save = usePutLedgerSettings();
  const add = useAddHoliday();
  const remove = useDeleteHoliday();
  const [form, setForm] = useState({ region: '', nightWeight: '3', weekendWeight: '3', lookbackDays: '91' });
  const [day, setDay] = useState({ date: '', name: '' });
  const s = settings.data;
  useEffect(() => {
    if (s) setForm({ region: s.region ?? '', nightWeight: String(s.nightWeight), weekendWeight: String(s.weekendWeight), lookbackDays: String(s.lookbackDays) });
  }, [s]);
  if (settings.error) return <Notice>{settings.error.message}</Notice>;
  if (!s) return null;
  const field = (name: string) => save.error && 'fieldMessage' in save.error ? (save.error as { fieldMessage(n: string): string | undefined }).fieldMessage(name) : undefined;
  const upcoming = s.holidays.filter((h) => h.date >= new Date().toISOString().slice(0, 10)).slice(0, 12);
  return (
    <View style={{ gap: space.md }} testID="ledger-settings">
      <TextField label="Holiday region (date-holidays code, e.g. GB-ENG; empty for days entered only)" value={form.region} onChangeText={(v) => setForm({ ...form, region: v })} error={field('region')} autoCapitalize="characters" />
      <TextField label="Points per night over a person's carried share" value={form.nightWeight} onChangeText={(v) => setForm({ ...form, nightWeight: v })} error={field('nightWeight')} keyboardType="decimal-pad" />
      <TextField label="Points per weekend shift over a person's carried share" value={form.weekendWeight} onChangeText={(v) => setForm({ ...form, weekendWeight: v })} error={field('weekendWeight')} keyboardType="decimal-pad" />
      <TextField label="Days looked back before a roster starts" value={form.lookbackDays} onChangeText={(v) => setForm({ ...form, lookbackDays: v })} error={field('lookbackDays')} keyboardType="number-pad" />
      <Button
        label="Save ledger settings"
        busy={save.isPending}
        onPress={() => save.mutate({ region: form.region.trim() || null, nightWeight: Number(form.nightWeight), weekendWeight: Number(form.weekendWeight), lookbackDays: Number(form.lookbackDays), version: s.version })}
        testID="ledger-settings-save"
      />
      {save.error && !field('region') && !field('nightWeight') && !field('weekendWeight') && !field('lookbackDays') ? <Notice>{save.error.message}</Notice> : null}
      {save.isSuccess ? <Notice kind="info">Saved. The next roster you solve reads the ledger with these weights.</Notice> : null}
      <Body bold>Public holidays to come</Body>
      {upcoming.length === 0 ? <Body muted>None in the next year.</Body> : null}
      {upcoming.map((h) => (
        <View key={h.date} style={{ flexDirection: 'row', alignItems: 'center', gap: space.sm, flexWrap: 'wrap' }}>
          <Body style={{ flex: 1 }}>{`${plainDay(h.date)}: ${h.name}${h.source === 'region' ? ` (${s.region})` : ' (entered)'}`}</Body>
          {h.id ? <Button kind="quiet" label="Remove" onPress={() => remove.mutate(h.id!)} /> : null}
        </View>
      ))}
      <TextField label="Add a day (YYYY-MM-DD)" value={day.date} onChangeText={(v) => setDay({ ...day, date: v })} />
      <TextField label="Its name" value={day.name} onChangeText={(v) => setDay({ ...day, name: v })} />
      <Button kind="quiet" label="Add holiday" busy={add.isPending} onPress={() => add.mutate(day, { onSuccess: () => setDay({ date: '', name: '' }) })} testID="holiday-add" />
      {add.error ? <Notice>{add.error.message}</Notice> : null}
    </View>
  );
}
