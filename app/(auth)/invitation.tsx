import { AcceptInvitationScreen } from '@/components/auth/accept-invitation-screen';

export default AcceptInvitationScreen;
