import { PairingsScreen } from '@/components/pairings/pairings-screen';

export default PairingsScreen;
