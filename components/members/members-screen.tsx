import { useState } from 'react';
import { ActivityIndicator, StyleSheet, View } from 'react-native';
import { colors, space } from '@/constants/theme';
import { inviteSchema } from '@/shared/auth/schemas';
import { useSession, type Role } from '@/hooks/api/get-session';
import { useMembers, type Member } from '@/hooks/api/get-members';
import { useUpdateMember } from '@/hooks/api/update-member';
import { useRemoveMember } from '@/hooks/api/remove-member';
import { useInvitations } from '@/hooks/api/get-invitations';
import { useCreateInvitation } from '@/hooks/api/create-invitation';
import { useRevokeInvitation } from '@/hooks/api/revoke-invitation';
import { useIsWide } from '@/hooks/use-is-wide';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { TextField } from '@/components/ui/text-field';
import { Body, Heading } from '@/components/ui/typography';
import { Section } from '@/components/auth/section';
import { checkForm, fieldError, formError, type FieldErrors } from '@/components/forms/form-errors';
import { RolePicker } from './role-picker';
import { PersonPicker } from './person-picker';
import { useLinkMemberPerson } from '@/hooks/api/link-member-person';

/** Admins: who is in the workspace and with which role; invitations sent and still open. */
export function MembersScreen() {
  const { data: session } = useSession();
  if (!session) return null;
  if (session.role !== 'admin') return <Notice>Only admins of this workspace manage its members.</Notice>;
  return (
    <View style={styles.page}>
      <Heading>Members of {session.workspace?.name}</Heading>
      <InviteForm />
      <Invitations />
      <MemberList myId={session.user.id} />
    </View>
  );
}

function InviteForm() {
  const invite = useCreateInvitation();
  const [email, setEmail] = useState('');
  const [role, setRole] = useState<Role>('staff');
  const [person, setPerson] = useState<{ id: number; name: string } | null>(null);
  const [picking, setPicking] = useState(false);
  const [errors, setErrors] = useState<FieldErrors>({});
  const submit = () => {
    const checked = checkForm(inviteSchema, { email, role, personId: person?.id ?? null });
    setErrors(checked.errors ?? {});
    if (checked.data) invite.mutate(checked.data, { onSuccess: () => { setEmail(''); setPerson(null); } });
  };
  return (
    <Section title="Invite someone" lead="They get an e-mail with a link that works once, for 7 days.">
      <TextField label="E-mail" value={email} onChangeText={setEmail} autoCapitalize="none" autoComplete="off" inputMode="email" error={fieldError(errors, invite.error, 'email')} onSubmitEditing={submit} testID="invite-email" />
      <RolePicker label="Role for the invitation" value={role} onChange={setRole} testID="invite-role" />
      {fieldError(errors, invite.error, 'role') ? <Notice>{fieldError(errors, invite.error, 'role')!}</Notice> : null}
      {person ? (
        <View style={styles.row}>
          <Body style={styles.rowText}>{`Will be rostered as ${person.name}`}</Body>
          <Button kind="quiet" label="Not this person" onPress={() => setPerson(null)} />
        </View>
      ) : picking ? (
        <PersonPicker label="Who are they on the roster?" onPick={(p) => { setPerson(p); setPicking(false); }} />
      ) : (
        <Button kind="quiet" label="Link to a person on the roster (optional)" onPress={() => setPicking(true)} />
      )}
      {fieldError(errors, invite.error, 'personId') ? <Notice>{fieldError(errors, invite.error, 'personId')!}</Notice> : null}
      {formError(invite.error, ['email', 'role', 'personId']) ? <Notice>{formError(invite.error, ['email', 'role'])!}</Notice> : null}
      {invite.isSuccess ? (
        <Notice kind={invite.data.mailSent ? 'info' : 'caution'}>
          {invite.data.mailSent ? `Invitation sent to ${invite.data.invitation.email}.` : `The invitation is saved, but the e-mail to ${invite.data.invitation.email} could not be sent. Try again later.`}
        </Notice>
      ) : null}
      <Button label="Send invitation" onPress={submit} busy={invite.isPending} testID="invite-submit" />
    </Section>
  );
}

function Invitations() {
  const invitations = useInvitations();
  const revoke = useRevokeInvitation();
  if (invitations.isPending) return <ActivityIndicator color={colors.loom} />;
  if (invitations.error) return <Notice>{invitations.error.message}</Notice>;
  if (invitations.data.length === 0) return null;
  return (
    <Section title="Open invitations">
      {invitations.data.map((i) => (
        <View key={i.id} style={styles.row} testID={`invitation-${i.email}`}>
          <View style={styles.rowText}>
            <Body bold>{i.email}</Body>
            <Body muted>{`${i.role} · ${i.status === 'expired' ? 'expired' : `until ${new Date(i.expiresAt).toLocaleDateString()}`}`}</Body>
          </View>
          <Button kind="quiet" label="Withdraw" onPress={() => revoke.mutate(i.id)} busy={revoke.isPending && revoke.variables === i.id} />
        </View>
      ))}
      {revoke.error ? <Notice>{revoke.error.message}</Notice> : null}
    </Section>
  );
}

function MemberList({ myId }: { myId: number }) {
  const members = useMembers();
  if (members.isPending) return <ActivityIndicator color={colors.loom} />;
  if (members.error) return <Notice>{members.error.message}</Notice>;
  return (
    <Section title={`Members (${members.data.length})`} lead="A workspace always keeps at least one admin." testID="member-list">
      {members.data.map((m) => (
        <MemberRow key={m.userId} member={m} isMe={m.userId === myId} />
      ))}
    </Section>
  );
}

function MemberRow({ member, isMe }: { member: Member; isMe: boolean }) {
  const wide = useIsWide();
  const update = useUpdateMember();
  const remove = useRemoveMember();
  const link = useLinkMemberPerson();
  const [confirming, setConfirming] = useState(false);
  const [picking, setPicking] = useState(false);
  const error = update.error ?? remove.error ?? link.error;
  return (
    <View style={[styles.member, wide && styles.memberWide]} testID={`member-${member.email}`}>
      <View style={styles.rowText}>
        <Body bold>{isMe ? `${member.displayName} (you)` : member.displayName}</Body>
        <Body muted>{member.email}</Body>
        <Body muted>{member.personName ? `Rostered as ${member.personName}` : 'Not linked to a person on the roster'}</Body>
        {picking ? (
          <PersonPicker label={`Who is ${member.displayName} on the roster?`} forUserId={member.userId} onPick={(p) => link.mutate({ userId: member.userId, personId: p.id }, { onSuccess: () => setPicking(false) })} />
        ) : (
          <View style={styles.linkRow}>
            <Button kind="quiet" label={member.personName ? 'Change person' : 'Link a person'} onPress={() => setPicking(true)} />
            {member.personName ? <Button kind="quiet" label="Unlink" onPress={() => link.mutate({ userId: member.userId, personId: null })} busy={link.isPending} /> : null}
          </View>
        )}
      </View>
      <RolePicker label={`Role of ${member.displayName}`} value={member.role} disabled={update.isPending} onChange={(role) => update.mutate({ userId: member.userId, role })} />
      {confirming ? (
        <View style={styles.confirm}>
          <Button kind="primary" label="Remove" onPress={() => remove.mutate(member.userId, { onSettled: () => setConfirming(false) })} busy={remove.isPending} />
          <Button kind="quiet" label="Keep" onPress={() => setConfirming(false)} />
        </View>
      ) : (
        <Button kind="quiet" label={isMe ? 'Leave' : 'Remove'} onPress={() => setConfirming(true)} />
      )}
      {error ? <Notice>{error.message}</Notice> : null}
    </View>
  );
}

const styles = StyleSheet.create({
  page: { gap: space.lg, maxWidth: 900 },
  row: { flexDirection: 'row', alignItems: 'center', gap: space.md, flexWrap: 'wrap' },
  rowText: { flex: 1, minWidth: 180, gap: 2 },
  member: { gap: space.sm, paddingVertical: space.md, borderTopWidth: 1, borderTopColor: colors.line },
  memberWide: { flexDirection: 'row', alignItems: 'center', flexWrap: 'wrap', gap: space.md },
  confirm: { flexDirection: 'row', gap: space.sm },
  linkRow: { flexDirection: 'row', gap: space.sm, flexWrap: 'wrap', marginTop: space.xs },
});
