import { MySwapsScreen } from '@/components/swaps/my-swaps-screen';

export default MySwapsScreen;
