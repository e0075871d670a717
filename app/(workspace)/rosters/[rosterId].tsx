import { RosterScreen } from '@/components/rosters/roster-screen';

export default RosterScreen;
