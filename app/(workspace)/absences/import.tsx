import { AbsenceImportScreen } from '@/components/absences/absence-import-screen';

export default AbsenceImportScreen;
