import { useEffect, useState } from 'react';
import { ActivityIndicator, Pressable, StyleSheet, Text, View } from 'react-native';
import { router, useLocalSearchParams } from 'expo-router';
import { colors, fonts, radius, space } from '@/constants/theme';
import { useIsWide } from '@/hooks/use-is-wide';
import { useDebounced } from '@/hooks/use-debounced';
import { usePeople, type PersonDto } from '@/hooks/api/get-people';
import { useSkills, type SkillDto } from '@/hooks/api/get-skills';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { TextField } from '@/components/ui/text-field';
import { Body, Heading } from '@/components/ui/typography';
import { Chip, CoordinatorsOnly, formatHours, LinkButton } from './inline-controls';
import { ExportLink } from './export-link';

type SortField = 'name' | 'contractedHours' | 'createdAt';
const PAGE_SIZE = 25;
const SORTS: Array<{ field: SortField; label: string }> = [
  { field: 'name', label: 'Name' },
  { field: 'contractedHours', label: 'Hours' },
  { field: 'createdAt', label: 'Added' },
];

/** Coordinators: everyone who can be rostered, searched, filtered by skill, sorted and paged on the server. */
export function PeopleScreen() {
  return (
    <CoordinatorsOnly what="people">
      <PeopleList />
    </CoordinatorsOnly>
  );
}

function PeopleList() {
  const wide = useIsWide();
  const { added } = useLocalSearchParams<{ added?: string }>();
  const [search, setSearch] = useState('');
  const q = useDebounced(search.trim(), 250);
  const [skillId, setSkillId] = useState<number | undefined>();
  const [sort, setSort] = useState<SortField>('name');
  const [order, setOrder] = useState<'asc' | 'desc'>('asc');
  const [page, setPage] = useState(1);
  useEffect(() => setPage(1), [q, skillId, sort, order]);
  const people = usePeople({ q: q || undefined, skillId, sort, order, page, pageSize: PAGE_SIZE });
  const skills = useSkills();
  const skillNames = new Map((skills.data ?? []).map((s) => [s.id, s.name]));

  const sortBy = (field: SortField) => {
    if (field === sort) setOrder(order === 'asc' ? 'desc' : 'asc');
    else {
      setSort(field);
      setOrder(field === 'createdAt' ? 'desc' : 'asc');
    }
  };
  const total = people.data?.total ?? 0;
  const pages = Math.max(1, Math.ceil(total / PAGE_SIZE));
  const filtered = Boolean(q || skillId);

  return (
    <View style={styles.page}>
      <View style={styles.head}>
        <Heading>People</Heading>
        <Body muted>Everyone who can be rostered, with their contracted hours and skills.</Body>
      </View>
      {added ? (
        <View role="status" testID="people-added">
          <Notice kind="info">{`Added ${added}. Open them from the list to add time away or terms.`}</Notice>
        </View>
      ) : null}
      <View style={styles.actions}>
        <LinkButton href="/people/new" label={added ? 'Add another person' : 'Add a person'} primary testID="people-add" />
        <LinkButton href="/people/import" label="Import CSV" testID="people-import" />
        <ExportLink />
        <LinkButton href="/people/skills" label="Skills" testID="people-skills" />
      </View>

      <View style={[styles.filters, wide && styles.filtersWide]}>
        <View style={wide ? styles.searchWide : undefined}>
          <TextField label="Search by name or e-mail" value={search} onChangeText={setSearch} placeholder="e.g. Priya" autoCapitalize="none" testID="people-search" />
        </View>
        {skills.data && skills.data.length > 0 ? <SkillFilter skills={skills.data} value={skillId} onChange={setSkillId} /> : null}
        {!wide ? (
          <View style={styles.filterGroup}>
            <Text style={styles.filterLabel}>Sort by</Text>
            <View style={styles.chips}>
              {SORTS.map((s) => (
                <Chip key={s.field} label={s.field === sort ? `${s.label} ${order === 'asc' ? '↑' : '↓'}` : s.label} selected={s.field === sort} onPress={() => sortBy(s.field)} accessibilityLabel={`Sort by ${s.label}${s.field === sort ? `, now ${order === 'asc' ? 'ascending' : 'descending'}` : ''}`} />
              ))}
            </View>
          </View>
        ) : null}
      </View>

      {people.isPending ? (
        <ActivityIndicator color={colors.loom} accessibilityLabel="Loading people" />
      ) : people.error ? (
        <View style={styles.gap}>
          <Notice>{`The people list could not be loaded: ${people.error.message}`}</Notice>
          <Button kind="quiet" label="Try again" onPress={() => void people.refetch()} />
        </View>
      ) : people.data.items.length === 0 ? (
        <Notice kind="info">{filtered ? 'Nobody matches this search. Clear the search or the skill filter to see everyone.' : 'No people yet. Add someone, or import a CSV file with one row per person.'}</Notice>
      ) : (
        <>
          <Text style={styles.count} aria-live="polite" testID="people-count">
            {`${total} ${total === 1 ? 'person' : 'people'}${filtered ? ' match' : ''}${pages > 1 ? ` · page ${page} of ${pages}` : ''}`}
          </Text>
          {wide ? <PeopleTable people={people.data.items} skillNames={skillNames} sort={sort} order={order} onSort={sortBy} /> : <PeopleCards people={people.data.items} skillNames={skillNames} />}
          {pages > 1 ? (
            <View style={styles.pager}>
              <Button kind="quiet" label="Previous page" onPress={() => setPage(page - 1)} disabled={page <= 1} />
              <Body muted>{`${page} / ${pages}`}</Body>
              <Button kind="quiet" label="Next page" onPress={() => setPage(page + 1)} disabled={page >= pages} />
            </View>
          ) : null}
        </>
      )}
    </View>
  );
}

function SkillFilter({ skills, value, onChange }: { skills: SkillDto[]; value: number | undefined; onChange: (id: number | undefined) => void }) {
  return (
    <View style={styles.filterGroup} role="group" aria-label="Filter by skill">
      <Text style={styles.filterLabel}>Skill</Text>
      <View style={styles.chips}>
        <Chip label="Any" selected={value === undefined} onPress={() => onChange(undefined)} accessibilityLabel="Any skill" />
        {skills.map((s) => (
          <Chip key={s.id} label={s.name} selected={value === s.id} onPress={() => onChange(value === s.id ? undefined : s.id)} accessibilityLabel={`Only people with ${s.name}`} />
        ))}
      </View>
    </View>
  );
}

const skillList = (p: PersonDto, names: Map<number, string>) => p.skillIds.map((id) => names.get(id)).filter(Boolean).join(', ');

function PeopleTable({ people, skillNames, sort, order, onSort }: { people: PersonDto[]; skillNames: Map<number, string>; sort: SortField; order: 'asc' | 'desc'; onSort: (f: SortField) => void }) {
  const header = (field: SortField | null, label: string, style: object) => {
    const active = field === sort;
    const content = <Text style={[styles.th, active && styles.thActive]}>{active ? `${label} ${order === 'asc' ? '↑' : '↓'}` : label}</Text>;
    return (
      <View role="columnheader" aria-sort={active ? (order === 'asc' ? 'ascending' : 'descending') : undefined} style={[styles.cell, style]}>
        {field ? (
          <Pressable role="button" onPress={() => onSort(field)} accessibilityLabel={`Sort by ${label}`}>
            {content}
          </Pressable>
        ) : (
          content
        )}
      </View>
    );
  };
  return (
    <View role="table" aria-label="People" style={styles.table} testID="people-table">
      <View role="row" style={[styles.tr, styles.thead]}>
        {header('name', 'Name', styles.colName)}
        {header(null, 'E-mail', styles.colEmail)}
        {header('contractedHours', 'Hours / week', styles.colHours)}
        {header(null, 'Skills', styles.colSkills)}
        {header('createdAt', 'Added', styles.colAdded)}
        {header(null, '', styles.colEdit)}
      </View>
      {people.map((p) => (
        <Pressable key={p.id} role="row" accessibilityLabel={`${p.name}, edit`} onPress={() => router.push(`/people/${p.id}`)} style={({ hovered }: { pressed: boolean; hovered?: boolean }) => [styles.tr, hovered && styles.trHover]} testID={`person-row-${p.name}`}>
            <View role="cell" style={[styles.cell, styles.colName]}>
              <Text style={styles.name}>{p.name}</Text>
            </View>
            <View role="cell" style={[styles.cell, styles.colEmail]}>
              <Text style={styles.td} numberOfLines={1}>{p.email ?? '—'}</Text>
            </View>
            <View role="cell" style={[styles.cell, styles.colHours]}>
              <Text style={styles.td}>{formatHours(p.contractedHours)}</Text>
            </View>
            <View role="cell" style={[styles.cell, styles.colSkills]}>
              <Text style={styles.td}>{skillList(p, skillNames) || '—'}</Text>
            </View>
            <View role="cell" style={[styles.cell, styles.colAdded]}>
              <Text style={styles.td}>{new Date(p.createdAt).toLocaleDateString('en-GB', { day: 'numeric', month: 'short', year: 'numeric' })}</Text>
            </View>
            <View role="cell" style={[styles.cell, styles.colEdit]}>
              <Text style={styles.edit}>Edit</Text>
            </View>
        </Pressable>
      ))}
    </View>
  );
}

function PeopleCards({ people, skillNames }: { people: PersonDto[]; skillNames: Map<number, string> }) {
  return (
    <View role="list" aria-label="People" style={styles.cards} testID="people-cards">
      {people.map((p) => (
        <Pressable key={p.id} role="listitem" accessibilityLabel={`${p.name}, ${formatHours(p.contractedHours)} a week, edit`} onPress={() => router.push(`/people/${p.id}`)} style={styles.card} testID={`person-card-${p.name}`}>
            <View style={styles.cardTop}>
              <Text style={styles.name}>{p.name}</Text>
              <Text style={styles.hours}>{`${formatHours(p.contractedHours)} / week`}</Text>
            </View>
            {p.email ? <Text style={styles.td}>{p.email}</Text> : null}
            <Text style={styles.muted}>{skillList(p, skillNames) || 'No skills recorded'}</Text>
        </Pressable>
      ))}
    </View>
  );
}

const styles = StyleSheet.create({
  page: { gap: space.lg },
  head: { gap: space.xs },
  actions: { flexDirection: 'row', flexWrap: 'wrap', gap: space.sm, alignItems: 'center' },
  filters: { gap: space.md },
  filtersWide: { flexDirection: 'row', alignItems: 'flex-end', flexWrap: 'wrap', gap: space.xl },
  searchWide: { width: 320 },
  filterGroup: { gap: space.xs },
  filterLabel: { fontFamily: fonts.bodyBold, fontSize: 15, color: colors.ink },
  chips: { flexDirection: 'row', flexWrap: 'wrap', gap: space.sm },
  gap: { gap: space.md },
  count: { fontFamily: fonts.body, color: colors.inkSoft, fontSize: 14 },
  table: { backgroundColor: colors.card, borderWidth: 1, borderColor: colors.line, borderRadius: radius.md, overflow: 'hidden' },
  thead: { backgroundColor: colors.loomSoft },
  tr: { flexDirection: 'row', borderBottomWidth: 1, borderBottomColor: colors.line, minHeight: 48, alignItems: 'center' },
  trHover: { backgroundColor: '#FBF6EC' },
  cell: { paddingHorizontal: space.md, paddingVertical: space.sm },
  colName: { flex: 3 },
  colEmail: { flex: 3 },
  colHours: { flex: 2 },
  colSkills: { flex: 4 },
  colAdded: { flex: 2 },
  colEdit: { flex: 1, alignItems: 'flex-end' },
  th: { fontFamily: fonts.bodyBold, fontSize: 14, color: colors.loom },
  thActive: { textDecorationLine: 'underline' },
  td: { fontFamily: fonts.body, fontSize: 15, color: colors.ink },
  name: { fontFamily: fonts.bodyBold, fontSize: 16, color: colors.ink },
  edit: { fontFamily: fonts.bodyBold, fontSize: 14, color: colors.loom, textDecorationLine: 'underline' },
  muted: { fontFamily: fonts.body, fontSize: 14, color: colors.inkSoft },
  cards: { gap: space.sm },
  card: { backgroundColor: colors.card, borderWidth: 1, borderColor: colors.line, borderRadius: radius.md, padding: space.lg, gap: space.xs },
  cardTop: { flexDirection: 'row', justifyContent: 'space-between', gap: space.md, flexWrap: 'wrap' },
  hours: { fontFamily: fonts.body, fontSize: 15, color: colors.loom },
  pager: { flexDirection: 'row', alignItems: 'center', justifyContent: 'space-between', gap: space.md },
});
