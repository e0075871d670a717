import { CompareScreen } from '@/components/compare/compare-screen';

export default CompareScreen;
