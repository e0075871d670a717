import { WishesScreen } from '@/components/staff/wishes-screen';

export default WishesScreen;
