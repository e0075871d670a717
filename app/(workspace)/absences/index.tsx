import { AbsencesScreen } from '@/components/absences/absences-screen';

export default AbsencesScreen;
