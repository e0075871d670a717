import { Link, type Href } from 'expo-router';
import { StyleSheet, Text, View } from 'react-native';
import { colors, fonts, radius, space } from '@/constants/theme';
import { usePeople } from '@/hooks/api/get-people';
import { useSkills } from '@/hooks/api/get-skills';
import { useRosters } from '@/hooks/api/get-rosters';
import { Body } from '@/components/ui/typography';

interface Step {
  key: string;
  done: boolean;
  title: string;
  why: string;
  href: Href;
  action: string;
}

/**
 * The way from an empty workspace to a published roster, each step ticked off from what the
 * workspace already holds, so a new coordinator always sees what to do next.
 */
export function NextSteps() {
  const skills = useSkills();
  const people = usePeople({ pageSize: 1 });
  const rosters = useRosters();
  if (!skills.data || !people.data || !rosters.data) return null;
  const latest = rosters.data.items[0];
  const steps: Step[] = [
    { key: 'skills', done: skills.data.length > 0, title: 'Name the skills seats need', why: 'First aid, night lead, driver… Seats can ask for one.', href: '/people/skills', action: 'Add skills' },
    { key: 'people', done: people.data.total > 0, title: 'Add the people you roster', why: 'With their contracted hours and skills; a CSV file works too.', href: '/people/new', action: 'Add a person' },
    { key: 'roster', done: rosters.data.total > 0, title: 'Start a roster', why: 'A period, its shift patterns and the rules to keep.', href: '/rosters', action: 'Start a roster' },
    {
      key: 'publish',
      done: rosters.data.items.some((r) => r.status === 'published'),
      title: 'Solve and publish it',
      why: 'Rotaloom finds the roster; you check it in the grid and e-mail everyone their shifts.',
      href: latest ? `/rosters/${latest.id}` : '/rosters',
      action: latest ? `Open ${latest.name}` : 'Rosters',
    },
  ];
  const next = steps.find((s) => !s.done);
  return (
    <View style={styles.box} role="list" aria-label="Next steps" testID="next-steps">
      <Body bold>{next ? 'Next steps' : 'Set up: every step done. Copy a roster forward for the next period from its page.'}</Body>
      {steps.map((s, i) => (
        <View key={s.key} role="listitem" style={[styles.step, s === next && styles.stepNext]} testID={`next-step-${s.key}`} aria-label={`Step ${i + 1}, ${s.done ? 'done' : s === next ? 'next' : 'to do'}: ${s.title}`}>
          <Text style={[styles.mark, s.done && styles.markDone]}>{s.done ? '✓' : String(i + 1)}</Text>
          <View style={{ flex: 1, gap: 2 }}>
            <Body bold={s === next} muted={s.done}>{s.title}</Body>
            {s.done ? null : <Body muted style={{ fontSize: 14 }}>{s.why}</Body>}
            {s === next ? (
              <Link href={s.href} style={styles.link} testID={`next-step-${s.key}-go`}>
                {`${s.action} ›`}
              </Link>
            ) : null}
          </View>
        </View>
      ))}
    </View>
  );
}

const styles = StyleSheet.create({
  box: { gap: space.sm, padding: space.lg, borderRadius: radius.md, backgroundColor: colors.card, borderWidth: 1, borderColor: colors.line },
  step: { flexDirection: 'row', gap: space.md, alignItems: 'flex-start', paddingVertical: space.xs },
  stepNext: { backgroundColor: colors.loomSoft, borderRadius: radius.sm, padding: space.sm },
  mark: { width: 28, height: 28, borderRadius: 14, textAlign: 'center', lineHeight: 28, fontFamily: fonts.bodyBold, color: colors.loom, borderWidth: 1, borderColor: colors.loom },
  markDone: { backgroundColor: colors.ok, borderColor: colors.ok, color: colors.white },
  link: { color: colors.loom, fontFamily: fonts.bodyBold, fontSize: 16, paddingVertical: space.xs },
});
