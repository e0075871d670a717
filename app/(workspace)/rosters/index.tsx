import { RostersScreen } from '@/components/rosters/rosters-screen';

export default RostersScreen;
