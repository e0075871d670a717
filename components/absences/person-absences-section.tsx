import { useState } from 'react';
import { View } from 'react-native';
import { space } from '@/constants/theme';
import { useAbsences } from '@/hooks/api/get-absences';
import { Button } from '@/components/ui/button';
import { Body } from '@/components/ui/typography';
import { Section } from '@/components/auth/section';
import { Loadable } from '@/components/rosters/panel';
import { AbsenceCard } from './absence-card';
import { AbsenceForm } from './absence-form';

/** A person's absences on their screen, with one more added in place. */
export function PersonAbsencesSection({ personId, personName }: { personId: number; personName: string }) {
  const list = useAbsences({ personId });
  const [adding, setAdding] = useState(false);
  return (
    <Section title="Absences" lead={`${personName}’s leave and other time away. Approved absences keep them off every shift they touch.`} testID="person-absences">
      <Loadable query={list} label="Absences">
        {(items) => (
          <View style={{ gap: space.sm }}>
            {items.length === 0 ? <Body muted>None recorded.</Body> : items.map((a) => <AbsenceCard key={a.id} absence={a} showName={false} />)}
          </View>
        )}
      </Loadable>
      {adding ? (
        <AbsenceForm mode="coordinator" person={{ id: personId, name: personName }} onDone={() => setAdding(false)} onCancel={() => setAdding(false)} />
      ) : (
        <Button kind="quiet" label="Add an absence" onPress={() => setAdding(true)} testID="person-absence-add" />
      )}
    </Section>
  );
}
