import { OverviewScreen } from '@/components/home/overview-screen';

export default OverviewScreen;
