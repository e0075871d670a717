import { useMemo, useState } from 'react';
import { Pressable, ScrollView, StyleSheet, Text, View } from 'react-native';
import { format } from 'date-fns';
import { colors, fonts, radius, space, wishMarks } from '@/constants/theme';
import { wishBody } from '@/shared/api/rosters';
import { useIsWide } from '@/hooks/use-is-wide';
import { usePeople, type PersonDto } from '@/hooks/api/get-people';
import { useShifts } from '@/hooks/api/get-shifts';
import { useRosterWishes, type RosterWish } from '@/hooks/api/get-roster-wishes';
import { useCreateRosterWish } from '@/hooks/api/create-roster-wish';
import { useUpdateRosterWish } from '@/hooks/api/update-roster-wish';
import { useDeleteRosterWish } from '@/hooks/api/delete-roster-wish';
import type { RosterDto, ShiftDto } from '@/hooks/api/roster-types';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { TextField } from '@/components/ui/text-field';
import { Body } from '@/components/ui/typography';
import { datesBetween } from '@/components/staff/format';
import { Loadable, Panel } from './panel';
import { dayWords, timeOf } from './format';
import { WishSettingsPanel } from './wish-settings-panel';
import { PersonOutcome } from './person-outcome';

type Kind = RosterWish['kind'];
const KINDS: Kind[] = ['prefer', 'avoid', 'cannot'];
const NAME_W = { phone: 92, wide: 150 };
/** Cells shrink to fit a phone's week or a wide screen's whole period, within thumb-friendly bounds. */
const cellSize = (width: number, nameW: number, days: number) => Math.max(26, Math.min(40, Math.floor((width - nameW) / Math.max(1, days))));

/** Monday-started weeks of the period, so a phone shows one at a time. */
function weeksOf(days: string[]): string[][] {
  const weeks: string[][] = [];
  for (const d of days) {
    if (weeks.length === 0 || new Date(`${d}T12:00:00Z`).getUTCDay() === 1) weeks.push([]);
    weeks[weeks.length - 1].push(d);
  }
  return weeks;
}

const whenWords = (iso?: string) => (iso ? format(new Date(iso), "d MMM 'at' HH:mm") : null);
export function enteredWords(w: RosterWish): string {
  const when = whenWords(w.updatedAt ?? w.createdAt);
  if (w.enteredByName) return `entered by ${w.enteredByName}${when ? ` on ${when}` : ''}`;
  return when ? `entered on ${when} (by an import or the demo)` : 'who entered it is not recorded';
}
const wishWords = (w: RosterWish) => `${wishMarks[w.kind].word}${w.kind === 'cannot' ? '' : ` (${w.strength} points)`}`;

/**
 * The coordinators' wishes view: every person × day of the period as prefer / avoid / cannot
 * marks, who entered each (hover or tap), wishes entered for anyone in place, and who has said
 * nothing yet. A phone shows one week with previous/next; a wide screen the whole period.
 */
export function WishesSection({ roster }: { roster: RosterDto }) {
  const wishes = useRosterWishes(roster.id);
  const people = usePeople({ pageSize: 200, sort: 'name' });
  const shifts = useShifts(roster.id);
  return (
    <View style={{ gap: space.lg }}>
      <Loadable query={wishes} label="Wishes">
        {(w) => (
          <Loadable query={people} label="People">
            {(p) => (
              <Loadable query={shifts} label="Shifts">
                {(s) => <WishesGrid roster={roster} wishes={w.items} silent={w.silent} people={p.items} shifts={s} />}
              </Loadable>
            )}
          </Loadable>
        )}
      </Loadable>
      <WishSettingsPanel roster={roster} />
    </View>
  );
}

interface Picked {
  personId: number;
  date: string;
}

function WishesGrid({ roster, wishes, silent, people, shifts }: { roster: RosterDto; wishes: RosterWish[]; silent?: Array<{ personId: number; name: string; hasLogin?: boolean }>; people: PersonDto[]; shifts: ShiftDto[] }) {
  const wide = useIsWide();
  const days = useMemo(() => datesBetween(roster.periodStart, roster.periodEnd), [roster.periodStart, roster.periodEnd]);
  const weeks = useMemo(() => weeksOf(days), [days]);
  const [week, setWeek] = useState(0);
  const [picked, setPicked] = useState<Picked | null>(null);
  const [hover, setHover] = useState<string | null>(null);
  const [width, setWidth] = useState(wide ? 900 : 320);
  const shown = wide ? days : (weeks[Math.min(week, weeks.length - 1)] ?? []);
  const nameW = wide ? NAME_W.wide : NAME_W.phone;
  const cell = cellSize(width, nameW, wide ? shown.length : 7);
  const box = { width: cell - 4, height: cell - 4 };
  const shiftDay = useMemo(() => new Map(shifts.map((s) => [s.id, s.startsLocal.slice(0, 10)])), [shifts]);
  const { byDay, byShiftDay, cannotDays } = useMemo(() => {
    const byDay = new Map<string, RosterWish>();
    const byShiftDay = new Map<string, RosterWish[]>();
    const cannotDays = new Map<number, Set<string>>();
    for (const w of wishes) {
      const date = w.date ?? (w.shiftId ? shiftDay.get(w.shiftId) : undefined);
      if (!date) continue;
      const key = `${w.personId}|${date}`;
      if (w.date) byDay.set(key, w);
      else byShiftDay.set(key, [...(byShiftDay.get(key) ?? []), w]);
      if (w.kind === 'cannot') cannotDays.set(w.personId, (cannotDays.get(w.personId) ?? new Set()).add(date));
    }
    return { byDay, byShiftDay, cannotDays };
  }, [wishes, shiftDay]);
  // Silent people come from the server when it says so; otherwise: nobody with a wish here.
  const stated = new Set(wishes.map((w) => w.personId));
  const quiet = silent ?? people.filter((p) => !stated.has(p.id)).map((p) => ({ personId: p.id, name: p.name, hasLogin: p.userId !== null }));
  const nameOf = (id: number) => people.find((p) => p.id === id)?.name ?? `person ${id}`;
  const describe = (personId: number, date: string) => {
    const day = byDay.get(`${personId}|${date}`);
    const perShift = byShiftDay.get(`${personId}|${date}`) ?? [];
    const parts = [day ? `${wishWords(day)} all day, ${enteredWords(day)}` : null, ...perShift.map((w) => `${wishWords(w)} the ${shifts.find((s) => s.id === w.shiftId)?.label ?? 'one'} shift, ${enteredWords(w)}`)].filter(Boolean);
    return `${nameOf(personId)} · ${dayWords(date)}: ${parts.length ? parts.join('; ') : 'no wish'}`;
  };

  return (
    <Panel title="Wishes" lead="Tap a day to enter, change or clear a wish for anyone, including people without a login. Coordinators can still enter wishes after the staff deadline." testID="wishes-view">
      <Legend />
      {!wide && weeks.length > 1 ? (
        <View style={styles.weekNav}>
          <Button kind="quiet" label="‹ Previous" onPress={() => setWeek(Math.max(0, week - 1))} disabled={week === 0} testID="wishes-prev" />
          <Body bold style={{ flex: 1, textAlign: 'center' }} testID="wishes-week">{`${dayWords(shown[0])} – ${dayWords(shown[shown.length - 1])}`}</Body>
          <Button kind="quiet" label="Next ›" onPress={() => setWeek(Math.min(weeks.length - 1, week + 1))} disabled={week >= weeks.length - 1} testID="wishes-next" />
        </View>
      ) : null}
      <Body muted style={styles.hint} testID="wishes-hint">{hover ?? (wide ? 'Point at a day to see who entered its wish and when.' : 'Tap a day to see its wish, who entered it and when.')}</Body>
      <View onLayout={(e) => setWidth(e.nativeEvent.layout.width)} />
      <ScrollView horizontal showsHorizontalScrollIndicator>
        <View role="table" aria-label={`Wishes, ${dayWords(shown[0] ?? roster.periodStart)} to ${dayWords(shown[shown.length - 1] ?? roster.periodEnd)}`}>
          <View role="row" style={styles.tr}>
            <View style={[styles.nameCell, { width: nameW }]} />
            {shown.map((d) => {
              const weekend = [0, 6].includes(new Date(`${d}T12:00:00Z`).getUTCDay());
              return (
                <View key={d} role="columnheader" style={[styles.headCell, { width: cell }, weekend && styles.weekend]}>
                  <Text style={styles.headDay}>{format(new Date(`${d}T12:00:00Z`), 'EEEEE')}</Text>
                  <Text style={styles.headNum}>{d.slice(8, 10).replace(/^0/, '')}</Text>
                </View>
              );
            })}
          </View>
          {people.map((p) => {
            const used = cannotDays.get(p.id)?.size ?? 0;
            const over = roster.maxCannotDays !== null && used > roster.maxCannotDays;
            return (
              <View key={p.id} role="row" style={styles.tr}>
                <View role="rowheader" style={[styles.nameCell, { width: nameW, minHeight: cell }]}>
                  <Text style={styles.name} numberOfLines={1}>{p.name}</Text>
                  {used > 0 ? <Text style={[styles.sub, over && styles.subOver]}>{`${used}${roster.maxCannotDays !== null ? `/${roster.maxCannotDays}` : ''} cannot`}</Text> : p.userId === null ? <Text style={styles.sub}>no login</Text> : null}
                </View>
                {shown.map((d) => {
                  const key = `${p.id}|${d}`;
                  const day = byDay.get(key);
                  const perShift = byShiftDay.get(key) ?? [];
                  const mark = day ?? perShift[0];
                  const m = mark ? wishMarks[mark.kind] : null;
                  const on = picked?.personId === p.id && picked.date === d;
                  const label = describe(p.id, d);
                  return (
                    <Pressable
                      key={d}
                      role="button"
                      accessibilityLabel={label}
                      aria-pressed={on}
                      onPress={() => { setPicked(on ? null : { personId: p.id, date: d }); setHover(label); }}
                      onHoverIn={() => setHover(label)}
                      onHoverOut={() => setHover(null)}
                      style={[styles.cell, box, m && { backgroundColor: m.fill, borderColor: m.border }, mark?.kind === 'cannot' && styles.cannotCell, on && styles.cellOn]}
                      testID={`wish-cell-${p.id}-${d}`}
                    >
                      {m ? <Text style={[styles.glyph, { color: m.ink }, !day && styles.shiftGlyph]}>{m.glyph}</Text> : null}
                      {!day && perShift.length > 0 ? <View style={[styles.shiftDot, { backgroundColor: m!.ink }]} /> : null}
                    </Pressable>
                  );
                })}
              </View>
            );
          })}
        </View>
      </ScrollView>
      {picked ? (
        <WishEditor
          key={`${picked.personId}|${picked.date}`}
          roster={roster}
          personId={picked.personId}
          personName={nameOf(picked.personId)}
          date={picked.date}
          dayWish={byDay.get(`${picked.personId}|${picked.date}`) ?? null}
          shifts={shifts.filter((s) => s.startsLocal.startsWith(picked.date))}
          shiftWishes={byShiftDay.get(`${picked.personId}|${picked.date}`) ?? []}
          onClose={() => setPicked(null)}
        />
      ) : null}
      {picked ? <PersonOutcome roster={roster} personId={picked.personId} personName={nameOf(picked.personId)} wishes={wishes} shifts={shifts} /> : null}
      <View style={styles.silent} testID="wishes-silent">
        <Body bold>{quiet.length === 0 ? 'Everyone has stated a wish.' : `Not stated yet (${quiet.length})`}</Body>
        {quiet.length > 0 ? (
          <View style={styles.silentList}>
            {quiet.map((q) => (
              <Pressable key={q.personId} role="button" accessibilityLabel={`Enter a wish for ${q.name}`} onPress={() => { setPicked({ personId: q.personId, date: shown[0] ?? roster.periodStart }); }} style={styles.silentChip}>
                <Text style={styles.silentName}>{q.hasLogin === false ? `${q.name} · no login` : q.name}</Text>
              </Pressable>
            ))}
          </View>
        ) : null}
        {quiet.length > 0 ? <Body muted>People without a login cannot state wishes themselves: ask them and enter theirs here.</Body> : null}
      </View>
    </Panel>
  );
}

function Legend() {
  return (
    <View style={styles.legend} accessibilityLabel="What the marks mean">
      {KINDS.map((k) => (
        <View key={k} style={styles.legendItem}>
          <View style={[styles.cell, styles.legendCell, { backgroundColor: wishMarks[k].fill, borderColor: wishMarks[k].border }, k === 'cannot' && styles.cannotCell]}>
            <Text style={[styles.glyph, { color: wishMarks[k].ink }]}>{wishMarks[k].glyph}</Text>
          </View>
          <Text style={styles.legendText}>{wishMarks[k].word}</Text>
        </View>
      ))}
      <View style={styles.legendItem}>
        <View style={[styles.cell, styles.legendCell]}>
          <Text style={[styles.glyph, styles.shiftGlyph, { color: colors.inkSoft }]}>+</Text>
          <View style={[styles.shiftDot, { backgroundColor: colors.inkSoft }]} />
        </View>
        <Text style={styles.legendText}>One shift only</Text>
      </View>
    </View>
  );
}

/** Set, change or clear one wish (for the whole day or one shift of it), in place. */
function WishEditor({ roster, personId, personName, date, dayWish, shifts, shiftWishes, onClose }: { roster: RosterDto; personId: number; personName: string; date: string; dayWish: RosterWish | null; shifts: ShiftDto[]; shiftWishes: RosterWish[]; onClose: () => void }) {
  return (
    <View style={styles.editor} testID="wish-editor">
      <View style={styles.editorHead}>
        <Body bold style={{ flex: 1 }}>{`${personName} · ${dayWords(date)}`}</Body>
        <Button kind="quiet" label="Close" onPress={onClose} testID="wish-editor-close" />
      </View>
      <WishChooser roster={roster} personId={personId} target={{ date }} title="The whole day" wish={dayWish} testID="wish-day" />
      {shifts.map((s) => (
        <WishChooser key={s.id} roster={roster} personId={personId} target={{ shiftId: s.id }} title={`${s.label} ${timeOf(s.startsLocal)}–${timeOf(s.endsLocal)} only`} wish={shiftWishes.find((w) => w.shiftId === s.id) ?? null} testID={`wish-shift-${s.id}`} />
      ))}
    </View>
  );
}

function WishChooser({ roster, personId, target, title, wish, testID }: { roster: RosterDto; personId: number; target: { date: string } | { shiftId: number }; title: string; wish: RosterWish | null; testID: string }) {
  const create = useCreateRosterWish();
  const update = useUpdateRosterWish();
  const remove = useDeleteRosterWish();
  const [strength, setStrength] = useState(String(wish?.strength ?? 5));
  const [note, setNote] = useState(wish?.note ?? '');
  const [problem, setProblem] = useState<string | null>(null);
  const frozen = roster.status === 'published';
  const busy = create.isPending || update.isPending || remove.isPending;
  const error = create.error ?? update.error ?? remove.error;
  const strengthValue = () => (strength.trim() === '' ? 5 : Number(strength.replace(',', '.')));
  const choose = (kind: Kind | 'none') => {
    setProblem(null);
    if (kind === 'none') {
      if (wish) remove.mutate({ rosterId: roster.id, id: wish.id });
      return;
    }
    if (wish) {
      if (wish.kind !== kind) update.mutate({ rosterId: roster.id, id: wish.id, kind });
      return;
    }
    const parsed = wishBody.safeParse({ personId, ...target, kind, strength: strengthValue(), note: note.trim() || null });
    if (!parsed.success) return setProblem(parsed.error.issues[0].path[0] === 'strength' ? 'Strength: a number from 0 to 1000' : parsed.error.issues[0].message);
    create.mutate({ rosterId: roster.id, ...parsed.data });
  };
  const saveDetails = () => {
    if (!wish) return;
    const s = strengthValue();
    if (!Number.isFinite(s) || s < 0 || s > 1000) return setProblem('Strength: a number from 0 to 1000');
    setProblem(null);
    update.mutate({ rosterId: roster.id, id: wish.id, strength: s, note: note.trim() || null });
  };
  return (
    <View style={styles.chooser} testID={testID}>
      <Body bold>{title}</Body>
      <View role="radiogroup" aria-label={`${title}: wish`} style={styles.kinds}>
        {KINDS.map((k) => {
          const on = wish?.kind === k;
          return (
            <Pressable key={k} role="radio" aria-checked={on} accessibilityLabel={`${title}: ${wishMarks[k].word}`} disabled={frozen || busy} onPress={() => choose(k)} style={[styles.kind, on && { backgroundColor: wishMarks[k].fill, borderColor: wishMarks[k].ink }]} testID={`${testID}-${k}`}>
              <Text style={[styles.kindGlyph, { color: wishMarks[k].ink }]}>{wishMarks[k].glyph}</Text>
              <Text style={styles.kindText}>{wishMarks[k].word}</Text>
            </Pressable>
          );
        })}
        <Pressable role="radio" aria-checked={!wish} accessibilityLabel={`${title}: no wish`} disabled={frozen || busy || !wish} onPress={() => choose('none')} style={[styles.kind, !wish && styles.kindNone]} testID={`${testID}-none`}>
          <Text style={styles.kindText}>No wish</Text>
        </Pressable>
      </View>
      {wish ? <Body muted testID={`${testID}-entered`}>{`${wishWords(wish)}, ${enteredWords(wish)}.`}</Body> : null}
      <View style={styles.details}>
        {wish?.kind !== 'cannot' ? (
          <View style={{ width: 150 }}>
            <TextField label="Strength (points)" value={strength} onChangeText={setStrength} inputMode="decimal" testID={`${testID}-strength`} />
          </View>
        ) : null}
        <View style={{ flex: 1, minWidth: 180 }}>
          <TextField label="Note (optional)" value={note} onChangeText={setNote} maxLength={500} testID={`${testID}-note`} />
        </View>
        {wish ? <Button kind="quiet" label="Save strength and note" onPress={saveDetails} disabled={frozen} busy={update.isPending} /> : null}
      </View>
      {frozen ? <Notice kind="info">The roster is published; reopen it to change wishes.</Notice> : null}
      {problem ? <Notice>{problem}</Notice> : null}
      {error ? <Notice>{error.message}</Notice> : null}
    </View>
  );
}

const styles = StyleSheet.create({
  weekNav: { flexDirection: 'row', alignItems: 'center', gap: space.sm },
  hint: { minHeight: 46, fontSize: 14 },
  tr: { flexDirection: 'row', alignItems: 'center' },
  nameCell: { paddingRight: space.xs, justifyContent: 'center' },
  name: { fontFamily: fonts.body, fontSize: 14, color: colors.ink },
  sub: { fontFamily: fonts.body, fontSize: 11, color: colors.inkSoft },
  subOver: { color: colors.danger, fontFamily: fonts.bodyBold },
  headCell: { alignItems: 'center', paddingVertical: 2, borderRadius: radius.sm },
  weekend: { backgroundColor: colors.loomSoft },
  headDay: { fontFamily: fonts.bodyBold, fontSize: 12, color: colors.inkSoft },
  headNum: { fontFamily: fonts.bodyBold, fontSize: 14, color: colors.ink },
  cell: { width: 34, height: 34, margin: 2, borderRadius: radius.sm, borderWidth: 1, borderColor: colors.line, backgroundColor: colors.white, alignItems: 'center', justifyContent: 'center' },
  cannotCell: { borderWidth: 2 },
  cellOn: { borderColor: colors.thread, borderWidth: 3 },
  glyph: { fontFamily: fonts.bodyBold, fontSize: 18, lineHeight: 20 },
  shiftGlyph: { fontSize: 13, lineHeight: 14 },
  shiftDot: { width: 5, height: 5, borderRadius: 3, marginTop: 1 },
  legend: { flexDirection: 'row', flexWrap: 'wrap', gap: space.md },
  legendItem: { flexDirection: 'row', alignItems: 'center', gap: space.xs },
  legendCell: { margin: 0, width: 26, height: 26 },
  legendText: { fontFamily: fonts.body, fontSize: 14, color: colors.ink },
  editor: { gap: space.md, padding: space.md, borderRadius: radius.sm, borderWidth: 1, borderColor: colors.thread, backgroundColor: colors.white },
  editorHead: { flexDirection: 'row', alignItems: 'center', gap: space.sm },
  chooser: { gap: space.sm, borderTopWidth: 1, borderTopColor: colors.line, paddingTop: space.sm },
  kinds: { flexDirection: 'row', flexWrap: 'wrap', gap: space.xs },
  kind: { minHeight: 44, paddingHorizontal: space.md, borderRadius: radius.sm, borderWidth: 1, borderColor: colors.line, backgroundColor: colors.white, flexDirection: 'row', alignItems: 'center', gap: space.xs },
  kindNone: { backgroundColor: colors.loomSoft, borderColor: colors.loom },
  kindGlyph: { fontFamily: fonts.bodyBold, fontSize: 18 },
  kindText: { fontFamily: fonts.bodyBold, fontSize: 15, color: colors.ink },
  details: { flexDirection: 'row', flexWrap: 'wrap', gap: space.md, alignItems: 'flex-end' },
  silent: { gap: space.sm, borderTopWidth: 1, borderTopColor: colors.line, paddingTop: space.md },
  silentList: { flexDirection: 'row', flexWrap: 'wrap', gap: space.xs },
  silentChip: { minHeight: 36, paddingHorizontal: space.md, borderRadius: 999, borderWidth: 1, borderColor: colors.line, backgroundColor: colors.white, justifyContent: 'center' },
  silentName: { fontFamily: fonts.body, fontSize: 14, color: colors.ink },
});
