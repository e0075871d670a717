import { TeamChangesScreen } from '@/components/swaps/team-changes-screen';

export default TeamChangesScreen;
