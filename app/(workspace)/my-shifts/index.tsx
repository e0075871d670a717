import { MyShiftsScreen } from '@/components/staff/my-shifts-screen';

export default MyShiftsScreen;
