import { ImportPeopleScreen } from '@/components/people/import-screen';

export default ImportPeopleScreen;
