import { useState } from 'react';
import { ActivityIndicator, StyleSheet, View } from 'react-native';
import { format } from 'date-fns';
import { colors, radius, space } from '@/constants/theme';
import { useSession } from '@/hooks/api/get-session';
import { useMyRosters } from '@/hooks/api/get-my-rosters';
import { useMyWishes } from '@/hooks/api/get-my-wishes';
import type { MyRoster, MyWish } from '@/shared/api/staff';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { Body, Heading } from '@/components/ui/typography';
import { ChoiceChips } from './choice-chips';
import { datesBetween, inZone, plainDay } from './format';
import { PairingRequestsSection } from './pairing-requests-section';
import { WeeklyWishForm } from './weekly-wish-form';
import { WishDayRow } from './wish-day-row';

/** Wishes for a roster open for them (prefer / avoid / cannot, per day or shift), and pairing requests. */
export function WishesScreen() {
  const rosters = useMyRosters();
  const [chosen, setChosen] = useState<number | null>(null);
  const candidates = (rosters.data ?? []).filter((r) => r.status !== 'published');
  const rosterId = chosen ?? candidates.find((r) => r.openForWishes)?.id ?? candidates[0]?.id ?? null;

  return (
    <View style={styles.page}>
      <Heading>Wishes</Heading>
      <Body muted>Tell your coordinator which days and shifts you would like, would rather avoid, or cannot work. The roster weighs every wish; “cannot” is kept as a rule.</Body>
      {rosters.isPending ? <ActivityIndicator color={colors.loom} accessibilityLabel="Loading rosters" /> : null}
      {rosters.error ? <Notice>{rosters.error.message}</Notice> : null}
      {rosters.data && candidates.length === 0 ? <Notice kind="info">No roster is being planned right now. When your coordinator starts one, you can state your wishes here.</Notice> : null}
      {candidates.length > 1 ? (
        <ChoiceChips
          label="Roster"
          choices={candidates.map((r) => ({ value: String(r.id), label: r.name }))}
          value={rosterId === null ? null : String(rosterId)}
          onChange={(v) => setChosen(Number(v))}
          testID="roster-picker"
        />
      ) : null}
      {rosterId !== null ? <RosterWishes rosterId={rosterId} /> : null}
      <PairingRequestsSection />
    </View>
  );
}

function RosterWishes({ rosterId }: { rosterId: number }) {
  const { data: session } = useSession();
  const zone = session?.workspace?.timeZone ?? 'UTC';
  const wishes = useMyWishes(rosterId);
  const [open, setOpen] = useState<string | null>(null);
  if (wishes.isPending) return <ActivityIndicator color={colors.loom} accessibilityLabel="Loading your wishes" />;
  if (wishes.error) {
    return (
      <View style={styles.section}>
        <Notice>{wishes.error.message}</Notice>
        <Button kind="quiet" label="Try again" onPress={() => void wishes.refetch()} />
      </View>
    );
  }
  const { roster, shifts, cannotDaysUsed } = wishes.data;
  const dayWishes = new Map<string, MyWish>();
  const shiftWishes = new Map<number, MyWish>();
  for (const w of wishes.data.wishes) {
    if (w.date) dayWishes.set(w.date, w);
    else if (w.shiftId) shiftWishes.set(w.shiftId, w);
  }
  const days = datesBetween(roster.periodStart, roster.periodEnd);
  const weeks: string[][] = [];
  for (const d of days) {
    if (weeks.length === 0 || new Date(`${d}T12:00:00Z`).getUTCDay() === 1) weeks.push([]);
    weeks[weeks.length - 1].push(d);
  }
  return (
    <View style={styles.section} testID="roster-wishes">
      <Heading level={2}>{roster.name}</Heading>
      <Body muted>{`${plainDay(roster.periodStart)} to ${plainDay(roster.periodEnd)}`}</Body>
      <Terms roster={roster} used={cannotDaysUsed} zone={zone} />
      {roster.openForWishes ? <WeeklyWishForm rosterId={roster.id} shifts={shifts} /> : null}
      {weeks.map((week) => (
        <View key={week[0]} style={styles.week}>
          <Body bold style={styles.weekTitle}>{`Week of ${plainDay(week[0])}`}</Body>
          {week.map((d) => (
            <WishDayRow
              key={d}
              rosterId={roster.id}
              date={d}
              wish={dayWishes.get(d) ?? null}
              shifts={shifts.filter((s) => s.startsLocal.startsWith(d))}
              shiftWishes={shiftWishes}
              readOnly={!roster.openForWishes}
              open={open === d}
              onToggle={() => setOpen(open === d ? null : d)}
            />
          ))}
        </View>
      ))}
    </View>
  );
}

function Terms({ roster, used, zone }: { roster: MyRoster; used: number; zone: string }) {
  const deadline = roster.wishDeadline ? format(inZone(roster.wishDeadline, zone), "EEEE d MMMM 'at' HH:mm") : null;
  return (
    <View style={styles.terms} testID="wish-terms">
      {roster.openForWishes ? (
        <Notice kind="info">{deadline ? `Open for wishes until ${deadline} (${zone}).` : 'Open for wishes until your coordinator publishes the roster.'}</Notice>
      ) : (
        <Notice kind="caution">
          {roster.status === 'published' ? 'This roster is published; your wishes are shown as they were, read-only.' : `Wishes closed${deadline ? ` on ${deadline}` : ''}. You can read yours but no longer change them.`}
        </Notice>
      )}
      <Body testID="cannot-limit">
        {roster.maxCannotDays === null ? `“Cannot” days so far: ${used} (your coordinator set no limit).` : `“Cannot” days: ${used} of at most ${roster.maxCannotDays} for this roster.`}
      </Body>
    </View>
  );
}

const styles = StyleSheet.create({
  page: { gap: space.lg, maxWidth: 760, width: '100%' },
  section: { gap: space.md },
  terms: { gap: space.sm },
  week: { gap: space.xs, backgroundColor: colors.card, borderRadius: radius.lg, borderWidth: 1, borderColor: colors.line, padding: space.md },
  weekTitle: { marginBottom: space.xs },
});
