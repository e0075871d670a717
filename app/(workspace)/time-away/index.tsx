import { TimeAwayScreen } from '@/components/staff/time-away-screen';

export default TimeAwayScreen;
