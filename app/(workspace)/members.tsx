import { MembersScreen } from '@/components/members/members-screen';

export default MembersScreen;
